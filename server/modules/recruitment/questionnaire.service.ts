import type { DataSource, EntityManager } from 'typeorm'
import type { Questionnaire, QuestionnaireInput } from '../../../shared/schemas/recruitment.js'
import { NotFoundError, ValidationError, type FieldError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { Study } from '../studies/study.entity.js'
import { ScreeningQuestionnaire } from './screening-questionnaire.entity.js'
import { Screening } from './screening.entity.js'

/** Checks that go beyond the schema: unique ids, options where needed, rules that fit the kind. */
function questionnaireProblems(input: QuestionnaireInput, characteristics: Map<string, Set<string>>): FieldError[] {
  const problems: FieldError[] = []
  const seen = new Set<string>()
  input.questions.forEach((q, i) => {
    const at = (field: string) => `questions.${i}.${field}`
    if (seen.has(q.id)) problems.push({ path: at('id'), message: `Two questions share the id "${q.id}".` })
    seen.add(q.id)
    const choice = q.kind === 'single_choice' || q.kind === 'multiple_choice'
    if (choice && q.options.length < 2) problems.push({ path: at('options'), message: 'A choice question needs at least two options.' })
    if (new Set(q.options.map((o) => o.value)).size !== q.options.length) problems.push({ path: at('options'), message: 'Each option needs its own value.' })
    if (q.kind === 'free_text' && q.rule) problems.push({ path: at('rule'), message: 'Free-text answers cannot carry a rule; a person reviews them.' })
    if (q.role !== 'information' && q.kind !== 'free_text' && !q.rule) {
      problems.push({ path: at('rule'), message: 'An inclusion or exclusion criterion needs a rule.' })
    }
    if (q.characteristic && (q.kind !== 'single_choice' || !characteristics.has(q.characteristic))) {
      problems.push({ path: at('characteristic'), message: 'Only a single-choice question can fill in one of the study’s sampling characteristics.' })
    }
    const values = q.characteristic ? characteristics.get(q.characteristic) : undefined
    if (values) {
      const stray = q.options.filter((o) => !values.has(o.value) && !isRuledOut(q, o.value))
      if (stray.length) problems.push({ path: at('options'), message: `Options ${stray.map((o) => o.value).join(', ')} are not values of the characteristic "${q.characteristic}".` })
    }
    const rule = q.rule
    if (rule && 'values' in rule && rule.values.some((v) => !q.options.some((o) => o.value === v))) {
      problems.push({ path: at('rule'), message: 'The rule names an option the question does not offer.' })
    }
    if (rule && (rule.operator === 'is' || rule.operator === 'is_not')) {
      const allowed = q.kind === 'yes_no' ? ['yes', 'no'] : q.options.map((o) => o.value)
      if (!allowed.includes(rule.value)) problems.push({ path: at('rule'), message: 'The rule names an answer the question does not offer.' })
    }
    if (rule?.operator === 'between' && rule.min > rule.max) problems.push({ path: at('rule'), message: 'The lower bound must not be above the upper bound.' })
  })
  return problems
}

/** An option an inclusion rule already turns away (e.g. "somewhere else") need not be a sampling value. */
function isRuledOut(q: QuestionnaireInput['questions'][number], value: string): boolean {
  const rule = q.rule
  if (!rule) return false
  if (q.role === 'inclusion' && rule.operator === 'is_one_of') return !rule.values.includes(value)
  if (q.role === 'inclusion' && rule.operator === 'is') return rule.value !== value
  if (q.role === 'exclusion' && rule.operator === 'is_one_of') return rule.values.includes(value)
  if (q.role === 'exclusion' && rule.operator === 'is') return rule.value === value
  return false
}

export class QuestionnaireService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  private async toDto(q: ScreeningQuestionnaire, manager: EntityManager = this.dataSource.manager): Promise<Questionnaire> {
    const screeningCount = await manager.countBy(Screening, { questionnaireId: q.id })
    return { id: q.id, version: q.version, intro: q.intro, questions: q.questions, createdAt: q.createdAt.toISOString(), screeningCount }
  }

  async currentEntity(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<ScreeningQuestionnaire | null> {
    return manager.findOne(ScreeningQuestionnaire, { where: { studyId }, order: { version: 'DESC' } })
  }

  async current(studyId: string): Promise<Questionnaire> {
    const q = await this.currentEntity(studyId)
    if (!q) throw new NotFoundError('screening questionnaire (the lead has not written one yet)')
    return this.toDto(q)
  }

  async versions(studyId: string): Promise<Questionnaire[]> {
    const rows = await this.dataSource.getRepository(ScreeningQuestionnaire).find({ where: { studyId }, order: { version: 'DESC' } })
    return Promise.all(rows.map((q) => this.toDto(q)))
  }

  /** Editing a version that already has screenings creates a new version; each screening keeps its own. */
  async save(studyId: string, input: QuestionnaireInput, actor: AuditActor): Promise<Questionnaire> {
    return this.dataSource.transaction(async (manager) => {
      const study = await manager.findOne(Study, { where: { id: studyId }, lock: { mode: 'pessimistic_write' } })
      if (!study) throw new NotFoundError('study')
      const characteristics = new Map(study.samplingCharacteristics.map((c) => [c.key, new Set(c.values.map((v) => v.value))]))
      const problems = questionnaireProblems(input, characteristics)
      if (problems.length) throw new ValidationError(problems[0]!.message, problems)
      const current = await this.currentEntity(studyId, manager)
      const used = current ? (await manager.countBy(Screening, { questionnaireId: current.id })) > 0 : false
      let saved: ScreeningQuestionnaire
      if (current && !used) {
        await manager.update(ScreeningQuestionnaire, { id: current.id }, { intro: input.intro, questions: input.questions as never, createdById: actor.id })
        saved = (await manager.findOneByOrFail(ScreeningQuestionnaire, { id: current.id }))
      } else {
        saved = await manager.save(
          manager.create(ScreeningQuestionnaire, { studyId, version: (current?.version ?? 0) + 1, intro: input.intro, questions: input.questions, createdById: actor.id }),
        )
      }
      await this.audit.record(
        actor,
        { action: 'screening_form.saved', studyId, targetType: 'screening_questionnaire', targetId: saved.id, details: { version: saved.version, newVersion: !current || used } },
        manager,
      )
      return this.toDto(saved, manager)
    })
  }
}
