import { once } from 'node:events'
import type { Writable } from 'node:stream'
import type { DataSource } from 'typeorm'
import type { ChecklistName } from '../../../shared/schemas/reports.js'
import { csvRows, toCsv } from '../../lib/csv.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { ReportsService } from './reports.service.js'

const cellText = (c: { count: number | null; percent: number | null; suppressed: boolean }, minCell: number) =>
  c.suppressed ? [`<${minCell}`, ''] : [c.count ?? '', c.percent === null ? '' : c.percent.toFixed(1)]

/** The report tables as CSV (papaparse through lib/csv.ts; formula cells neutralised; optional byte-order mark). */
export class ReportExportsService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly reports: ReportsService,
    private readonly audit: AuditService,
  ) {}

  async characteristics(studyId: string, minCell: number, bom: boolean): Promise<string> {
    const r = await this.reports.characteristics(studyId, minCell)
    const rows: unknown[][] = r.groups.flatMap((g) => g.rows.map((row) => [g.label, row.label, ...cellText(row.interviewed, r.minCell), ...cellText(row.consented, r.minCell)]))
    rows.push(['Total', '', r.totals.interviewed, '', r.totals.consented, ''])
    if (r.duration) rows.push(['Interview duration (minutes)', `mean ${r.duration.mean}; median ${r.duration.median}; range ${r.duration.min}–${r.duration.max}`, r.duration.n, '', '', ''])
    rows.push(['Note', r.roundingRule, '', '', '', ''], ['Note', r.suppressionRule, '', '', '', ''])
    return toCsv(['characteristic', 'value', 'interviewed_n', 'interviewed_percent', 'consented_n', 'consented_percent'], rows, { bom })
  }

  async flow(studyId: string, bom: boolean): Promise<string> {
    const f = await this.reports.flow(studyId)
    const labelOf = new Map(f.stages.map((s) => [s.key, s.label]))
    return toCsv(['row', 'stage', 'reason', 'count'], [...f.stages.map((s) => ['stage', s.label, '', s.count]), ...f.exits.map((e) => ['exit', labelOf.get(e.after) ?? e.after, e.reason, e.count])], { bom })
  }

  async checklist(studyId: string, name: ChecklistName, bom: boolean): Promise<string> {
    const c = await this.reports.checklist(studyId, name)
    return toCsv(['number', 'domain', 'item', 'where_addressed', 'note', 'done'], c.items.map((i) => [i.number, i.domain, i.label, i.where, i.note, i.done ? 'yes' : 'no']), { bom })
  }

  /** The study's audit trail, streamed in batches; exporting it is itself audited. */
  async auditTrail(studyId: string, out: Writable, bom: boolean, actor: AuditActor): Promise<void> {
    await this.audit.record(actor, { action: 'audit.exported', studyId, targetType: 'study', targetId: studyId, details: {} })
    const write = async (chunk: string) => {
      if (!out.write(chunk)) await once(out, 'drain')
    }
    await write((bom ? '\uFEFF' : '') + csvRows([['at', 'actor', 'action', 'target_type', 'target_id', 'ip', 'details']]))
    let after = '0'
    for (;;) {
      const rows: { id: string; at: Date; actor_email: string | null; action: string; target_type: string | null; target_id: string | null; ip: string | null; details: unknown }[] = await this.dataSource.query(
        `SELECT id, at, actor_email, action, target_type, target_id, ip, details FROM audit_events WHERE study_id = $1 AND id > $2 ORDER BY id LIMIT 1000`,
        [studyId, after],
      )
      if (!rows.length) break
      after = rows[rows.length - 1]!.id
      await write(csvRows(rows.map((r) => [new Date(r.at).toISOString(), r.actor_email ?? '', r.action, r.target_type ?? '', r.target_id ?? '', r.ip ?? '', JSON.stringify(r.details)])))
    }
  }
}
