import type { DataSource } from 'typeorm'
import type { RecruitmentSettings, RecruitmentSettingsUpdate } from '../../../shared/schemas/recruitment.js'
import { NotFoundError, ValidationError, type FieldError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { Study } from '../studies/study.entity.js'

export function settingsOf(study: Study): RecruitmentSettings {
  return {
    recruiting: study.recruiting,
    publicSummary: study.publicSummary,
    whoCanTakePart: study.whoCanTakePart,
    samplingCharacteristics: study.samplingCharacteristics,
    samplingTargets: study.samplingTargets,
    resources: study.resources,
    withdrawalRule: study.withdrawalRule,
    dataRemovalGraceDays: study.dataRemovalGraceDays,
  }
}

/** Targets must name known characteristics and values; keys must be unique. */
function settingsProblems(settings: RecruitmentSettings): FieldError[] {
  const problems: FieldError[] = []
  const known = new Map(settings.samplingCharacteristics.map((c) => [c.key, new Set(c.values.map((v) => v.value))]))
  if (known.size !== settings.samplingCharacteristics.length) {
    problems.push({ path: 'samplingCharacteristics', message: 'Each characteristic needs its own key.' })
  }
  settings.samplingTargets.forEach((target, i) => {
    for (const [key, value] of Object.entries(target.cell)) {
      if (!known.get(key)?.has(value)) {
        problems.push({ path: `samplingTargets.${i}`, message: `The target names ${key} = ${value}, which is not among the characteristics.` })
      }
    }
  })
  return problems
}

export class RecruitmentSettingsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  async get(studyId: string): Promise<RecruitmentSettings> {
    const study = await this.dataSource.getRepository(Study).findOneBy({ id: studyId })
    if (!study) throw new NotFoundError('study')
    return settingsOf(study)
  }

  async update(studyId: string, input: RecruitmentSettingsUpdate, actor: AuditActor): Promise<RecruitmentSettings> {
    return this.dataSource.transaction(async (manager) => {
      const study = await manager.findOne(Study, { where: { id: studyId }, lock: { mode: 'pessimistic_write' } })
      if (!study) throw new NotFoundError('study')
      const next = { ...settingsOf(study), ...Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined)) } as RecruitmentSettings
      const problems = settingsProblems(next)
      if (problems.length) throw new ValidationError(problems[0]!.message, problems)
      const changed = (Object.keys(input) as (keyof RecruitmentSettings)[]).filter(
        (k) => input[k] !== undefined && JSON.stringify(input[k]) !== JSON.stringify(settingsOf(study)[k]),
      )
      if (changed.length) {
        await manager.update(Study, { id: studyId }, next as never)
        await this.audit.record(actor, { action: 'recruitment.settings_changed', studyId, targetType: 'study', targetId: studyId, details: { changed } }, manager)
      }
      return next
    })
  }
}
