import type { DataSource } from 'typeorm'
import { characteristicsTable, durationSummary } from '../../../shared/reports/characteristics.js'
import { checklistReport } from '../../../shared/reports/checklists.js'
import { recruitmentFlow } from '../../../shared/reports/flow.js'
import { methodsParagraphs } from '../../../shared/reports/methods-summary.js'
import type { CharacteristicsReport, ChecklistItemUpdate, ChecklistName, ChecklistReport, FlowReport, MethodsSummary } from '../../../shared/schemas/reports.js'
import { NotFoundError } from '../../lib/errors.js'
import type { AgreementService } from '../analysis/agreement.service.js'
import type { SaturationService } from '../analysis/saturation.service.js'
import { reasonsOf } from '../recruitment/recruitment-summary.service.js'
import { Study } from '../studies/study.entity.js'
import { ChecklistAnswer } from './checklist-answer.entity.js'

/**
 * The study's reports: characteristics (small cells suppressed), the recruitment flow, checklists and
 * a methods summary. Counts only; quotes are assembled in quote-export.service.ts through the consent policy.
 */
export class ReportsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly agreement: AgreementService,
    private readonly saturation: SaturationService,
  ) {}

  private async study(studyId: string): Promise<Study> {
    const study = await this.dataSource.getRepository(Study).findOneBy({ id: studyId })
    if (!study) throw new NotFoundError('study')
    return study
  }

  async characteristics(studyId: string, minCell: number): Promise<CharacteristicsReport> {
    const study = await this.study(studyId)
    const people: { characteristics: Record<string, string> | null; consented: boolean; interviewed: boolean }[] = await this.dataSource.query(
      `SELECT p.characteristics,
              EXISTS (SELECT 1 FROM consent_records c WHERE c.participant_id = p.id) AS consented,
              EXISTS (SELECT 1 FROM interviews i WHERE i.participant_id = p.id AND i.status = 'done') AS interviewed
         FROM participants p WHERE p.study_id = $1`,
      [studyId],
    )
    const durations: { actual_minutes: number }[] = await this.dataSource.query(`SELECT actual_minutes FROM interviews WHERE study_id = $1 AND status = 'done' AND actual_minutes IS NOT NULL`, [studyId])
    const [round]: { show_characteristics: string[] }[] = await this.dataSource.query(`SELECT show_characteristics FROM review_rounds WHERE study_id = $1 ORDER BY created_at DESC LIMIT 1`, [studyId])
    return characteristicsTable({
      characteristics: study.samplingCharacteristics.map((c) => ({ key: c.key, label: c.label, values: c.values.map((v) => ({ value: v.value, label: v.label })) })),
      interviewed: people.filter((p) => p.interviewed).map((p) => p.characteristics ?? {}),
      consented: people.filter((p) => p.consented).map((p) => p.characteristics ?? {}),
      minCell,
      durations: durations.map((d) => d.actual_minutes),
      quoteLabelKeys: round?.show_characteristics ?? [],
    })
  }

  async flow(studyId: string): Promise<FlowReport> {
    await this.study(studyId)
    const rows: { status: string; help_seeking: boolean; overridden: boolean; failing: { kind: string; reason: string | null; question: string }[] | null; screened: boolean; consented: boolean; interviewed: boolean; withdrawn: boolean }[] =
      await this.dataSource.query(
        `SELECT p.status, p.help_seeking, p.override IS NOT NULL AS overridden, s.result->'failing' AS failing, s.id IS NOT NULL AS screened,
                EXISTS (SELECT 1 FROM consent_records c WHERE c.participant_id = p.id) AS consented,
                EXISTS (SELECT 1 FROM interviews i WHERE i.participant_id = p.id AND i.status = 'done') AS interviewed,
                EXISTS (SELECT 1 FROM withdrawals w WHERE w.participant_id = p.id) AS withdrawn
           FROM participants p
           LEFT JOIN LATERAL (SELECT id, result FROM screenings WHERE participant_id = p.id ORDER BY at DESC LIMIT 1) s ON true
          WHERE p.study_id = $1`,
        [studyId],
      )
    return recruitmentFlow(
      rows.map((r) => ({
        status: r.status as never,
        screened: r.screened,
        everEligible: r.consented || r.status === 'eligible' || r.status === 'consented',
        consented: r.consented,
        interviewed: r.interviewed,
        withdrawn: r.withdrawn || r.status === 'withdrawn',
        exitReason: r.status === 'not_eligible' ? (reasonsOf(r)[0] ?? null) : r.status === 'screening' ? 'Awaiting review' : null,
      })),
    )
  }

  async checklist(studyId: string, name: ChecklistName): Promise<ChecklistReport> {
    await this.study(studyId)
    const saved = await this.dataSource.getRepository(ChecklistAnswer).find({ where: { studyId, checklist: name } })
    return checklistReport(name, saved.map((s) => ({ number: s.number, where: s.where, note: s.note, done: s.done })))
  }

  async saveChecklistItem(studyId: string, name: ChecklistName, number: string, input: ChecklistItemUpdate): Promise<ChecklistReport> {
    const current = await this.checklist(studyId, name)
    if (!current.items.some((i) => i.number === number)) throw new NotFoundError(`${name.toUpperCase()} item`)
    await this.dataSource.getRepository(ChecklistAnswer).upsert({ studyId, checklist: name, number, where: input.where, note: input.note, done: input.done }, ['studyId', 'checklist', 'number'])
    return this.checklist(studyId, name)
  }

  async methods(studyId: string): Promise<MethodsSummary> {
    await this.study(studyId)
    const [modes, durations, coders, rounds, answers] = await Promise.all([
      this.dataSource.query(`SELECT mode, count(*)::int AS count FROM interviews WHERE study_id = $1 AND status = 'done' GROUP BY mode ORDER BY count DESC`, [studyId]) as Promise<{ mode: string; count: number }[]>,
      this.dataSource.query(`SELECT actual_minutes FROM interviews WHERE study_id = $1 AND status = 'done' AND actual_minutes IS NOT NULL ORDER BY actual_minutes`, [studyId]) as Promise<{ actual_minutes: number }[]>,
      this.dataSource.query(`SELECT count(DISTINCT coder_id)::int AS n FROM excerpts WHERE study_id = $1`, [studyId]) as Promise<{ n: number }[]>,
      this.dataSource.query(`SELECT count(*)::int AS n FROM review_rounds WHERE study_id = $1`, [studyId]) as Promise<{ n: number }[]>,
      this.dataSource.query(`SELECT count(*)::int AS n FROM partner_answers a JOIN review_rounds r ON r.id = a.round_id WHERE r.study_id = $1 AND a.submitted_at IS NOT NULL`, [studyId]) as Promise<{ n: number }[]>,
    ])
    const minutes = durations.map((d) => d.actual_minutes)
    const agreement = await this.agreement.agreement(studyId, 'lead')
    const saturation = await this.saturation.assess(studyId, { baseSize: 4, runLength: 2, threshold: 0.05 })
    const value = (c: { value: number | null } | null | undefined) => (c && c.value !== null ? Math.round(c.value * 1000) / 1000 : null)
    const facts: MethodsSummary['facts'] = {
      interviews: modes.reduce((sum, m) => sum + m.count, 0),
      modes,
      duration: durationSummary(minutes),
      coders: coders[0]?.n ?? 0,
      agreement: agreement.enabled && agreement.overall ? { unit: agreement.unit, alpha: value(agreement.overall.alpha), kappa: value(agreement.overall.kappa), percentAgreement: agreement.overall.percentAgreement } : null,
      saturation: saturation.interviews.length ? saturation.methodsSentence : null,
      reviewRounds: rounds[0]?.n ?? 0,
      partnerAnswers: answers[0]?.n ?? 0,
    }
    return { paragraphs: methodsParagraphs(facts), facts }
  }
}
