import type { DataSource } from 'typeorm'
import type { RecruitmentSummary, ReferralSource } from '../../../shared/schemas/recruitment.js'
import { NotFoundError } from '../../lib/errors.js'
import { Study } from '../studies/study.entity.js'

interface Row {
  status: string
  help_seeking: boolean
  source: ReferralSource
  characteristics: Record<string, string>
  overridden: boolean
  failing: { kind: string; reason: string | null; question: string }[] | null
  screened: boolean
}

/** Why a person was not enrolled, in words a team reports (counts only; no individual records). */
export function reasonsOf(row: Pick<Row, 'overridden' | 'help_seeking' | 'failing'>): string[] {
  if (row.overridden) return ['Decided by the lead after screening']
  if (row.help_seeking) return ['Looking for help with their own care']
  const failing = row.failing ?? []
  if (!failing.length) return ['Not eligible (no criterion recorded)']
  return failing.map((f) => (f.kind === 'exclusion_met' ? `Exclusion: ${f.question}` : `Did not meet: ${f.question}`))
}

/** The recruitment dashboard: funnel, reasons, sources and the purposive-sampling matrix. */
export class RecruitmentSummaryService {
  constructor(private readonly dataSource: DataSource) {}

  async summary(studyId: string): Promise<RecruitmentSummary> {
    const study = await this.dataSource.getRepository(Study).findOneBy({ id: studyId })
    if (!study) throw new NotFoundError('study')
    const rows: Row[] = await this.dataSource.query(
      `SELECT p.status, p.help_seeking, p.source, p.characteristics, p.override IS NOT NULL AS overridden,
              s.result->'failing' AS failing, s.id IS NOT NULL AS screened
         FROM participants p
         LEFT JOIN LATERAL (SELECT id, result FROM screenings WHERE participant_id = p.id ORDER BY at DESC LIMIT 1) s ON true
        WHERE p.study_id = $1`,
      [studyId],
    )
    const count = (pred: (r: Row) => boolean) => rows.filter(pred).length
    const reasons = new Map<string, number>()
    for (const row of rows.filter((r) => r.status === 'not_eligible')) {
      for (const reason of new Set(reasonsOf(row))) reasons.set(reason, (reasons.get(reason) ?? 0) + 1)
    }
    const sources = new Map<ReferralSource, number>()
    for (const row of rows) sources.set(row.source, (sources.get(row.source) ?? 0) + 1)
    const labels = new Map(study.samplingCharacteristics.flatMap((c) => c.values.map((v) => [`${c.key}=${v.value}`, `${c.label}: ${v.label}`] as const)))
    const eligible = rows.filter((r) => r.status === 'eligible')
    return {
      funnel: {
        enquired: rows.length,
        screened: count((r) => r.screened),
        eligible: eligible.length,
        notEligible: count((r) => r.status === 'not_eligible'),
        awaitingReview: count((r) => r.status === 'screening'),
      },
      notEnrolledReasons: [...reasons].map(([reason, n]) => ({ reason, count: n })).sort((a, b) => b.count - a.count || a.reason.localeCompare(b.reason)),
      target: study.targetSampleSize,
      sources: [...sources].map(([source, n]) => ({ source, count: n })).sort((a, b) => b.count - a.count),
      matrix: study.samplingTargets.map((t) => ({
        cell: t.cell,
        label: Object.entries(t.cell).map(([k, v]) => labels.get(`${k}=${v}`) ?? `${k}: ${v}`).join(' × '),
        target: t.target,
        enrolled: eligible.filter((r) => Object.entries(t.cell).every(([k, v]) => r.characteristics?.[k] === v)).length,
      })),
    }
  }
}
