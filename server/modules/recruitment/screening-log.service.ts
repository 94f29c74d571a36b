import Papa from 'papaparse'
import type { DataSource } from 'typeorm'
import { safeCell } from '../../lib/csv.js'
import { NotFoundError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { Study } from '../studies/study.entity.js'

const BASE_COLUMNS = ['pseudonym', 'enquired_at', 'source', 'source_detail', 'status', 'screened_at', 'questionnaire_version', 'computed_outcome', 'help_seeking', 'criteria_not_met', 'needs_review', 'override_outcome', 'override_reason', 'characteristics']
const CONTACT_COLUMNS = ['name', 'email', 'phone', 'country', 'time_zone']

/** The screening log as CSV (RFC 4180 quoting by papaparse): pseudonyms only unless the lead asks for contacts. */
export class ScreeningLogService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  async csv(studyId: string, withContacts: boolean, actor: AuditActor): Promise<{ filename: string; body: string }> {
    const study = await this.dataSource.getRepository(Study).findOneBy({ id: studyId })
    if (!study) throw new NotFoundError('study')
    const rows: Record<string, unknown>[] = await this.dataSource.query(
      `SELECT p.pseudonym, p.created_at, p.source, p.source_detail, p.status, p.help_seeking, p.characteristics, p.override,
              s.at AS screened_at, q.version, s.result,
              ${withContacts ? 'c.name, c.email, c.phone, c.country, c.time_zone' : 'NULL AS name'}
         FROM participants p
         LEFT JOIN LATERAL (SELECT at, result, questionnaire_id FROM screenings WHERE participant_id = p.id ORDER BY at DESC LIMIT 1) s ON true
         LEFT JOIN screening_questionnaires q ON q.id = s.questionnaire_id
         ${withContacts ? 'LEFT JOIN participant_contacts c ON c.participant_id = p.id' : ''}
        WHERE p.study_id = $1
        ORDER BY p.sequence`,
      [studyId],
    )
    const columns = withContacts ? [...BASE_COLUMNS, ...CONTACT_COLUMNS] : BASE_COLUMNS
    const data = rows.map((r) => {
      const result = r.result as { outcome: string; failing: { question: string }[]; review: { question: string }[] } | null
      const override = r.override as { outcome: string; reason: string } | null
      const record: Record<string, unknown> = {
        pseudonym: r.pseudonym,
        enquired_at: (r.created_at as Date).toISOString(),
        source: r.source,
        source_detail: r.source_detail,
        status: r.status,
        screened_at: r.screened_at ? (r.screened_at as Date).toISOString() : '',
        questionnaire_version: r.version ?? '',
        computed_outcome: result?.outcome ?? '',
        help_seeking: r.help_seeking ? 'yes' : 'no',
        criteria_not_met: (result?.failing ?? []).map((f) => f.question).join('; '),
        needs_review: (result?.review ?? []).map((f) => f.question).join('; '),
        override_outcome: override?.outcome ?? '',
        override_reason: override?.reason ?? '',
        characteristics: Object.entries((r.characteristics as Record<string, string>) ?? {}).map(([k, v]) => `${k}=${v}`).join('; '),
      }
      if (withContacts) Object.assign(record, { name: r.name, email: r.email, phone: r.phone, country: r.country, time_zone: r.time_zone })
      return columns.map((c) => safeCell(record[c]))
    })
    await this.audit.record(actor, { action: 'export.screening_log', studyId, targetType: 'study', targetId: studyId, details: { rows: data.length, contacts: withContacts } })
    const body = Papa.unparse({ fields: columns, data }, { quotes: false, newline: '\r\n' })
    const date = new Date().toISOString().slice(0, 10)
    return { filename: `screening-log-${study.code}-${date}${withContacts ? '-with-contacts' : ''}.csv`, body: `\uFEFF${body}\r\n` }
  }
}
