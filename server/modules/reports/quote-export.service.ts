import { once } from 'node:events'
import type { Writable } from 'node:stream'
import type { DataSource } from 'typeorm'
import type { QuotesReport } from '../../../shared/schemas/reports.js'
import { csvRows } from '../../lib/csv.js'
import type { ConsentService } from '../consent/consent.service.js'
import { characteristicLabels } from '../recruitment/characteristic-labels.js'
import { Study } from '../studies/study.entity.js'

interface QuoteRow {
  theme_id: string
  theme_name: string
  theme_status: string
  text: string
  participant_id: string
  pseudonym: string
  characteristics: Record<string, string> | null
}

const excerpts = (n: number) => `${n} excerpt${n === 1 ? '' : 's'}`

const QUERY = `SELECT t.id AS theme_id, t.name AS theme_name, t.status AS theme_status, e.text, e.participant_id, p.pseudonym, p.characteristics
                 FROM themes t JOIN theme_excerpts te ON te.theme_id = t.id JOIN excerpts e ON e.id = te.excerpt_id JOIN participants p ON p.id = e.participant_id
                WHERE t.study_id = $1 AND e.text <> ''
                ORDER BY t.parent_id NULLS FIRST, t.position, t.id, te.position, te.excerpt_id`

/**
 * Quotes by theme: each theme's supporting excerpts, only of participants who agreed to be quoted and
 * have not withdrawn their data (the consent policy's mayQuote), labelled with the pseudonym and the
 * characteristics chosen for the latest review round. What was left out is reported as counts only.
 * The CSV streams from a database cursor in batches, so memory stays flat however many excerpts.
 */
export class QuoteExportService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly consent: ConsentService,
  ) {}

  private async labels(studyId: string): Promise<{ keys: string[]; label: (characteristics: Record<string, string> | null) => { label: string; value: string }[] }> {
    const study = await this.dataSource.getRepository(Study).findOneByOrFail({ id: studyId })
    const [round]: { show_characteristics: string[] }[] = await this.dataSource.query(`SELECT show_characteristics FROM review_rounds WHERE study_id = $1 ORDER BY created_at DESC LIMIT 1`, [studyId])
    const keys = round?.show_characteristics ?? []
    return {
      keys,
      label: (characteristics) => characteristicLabels(study.samplingCharacteristics, keys, characteristics),
    }
  }

  /** Walks the quotes in batches through a cursor, deciding consent once per participant. */
  private async walk(studyId: string, visit: (row: QuoteRow, verdict: 'quote' | 'declined' | 'withdrawn') => Promise<void> | void): Promise<void> {
    const decided = new Map<string, 'quote' | 'declined' | 'withdrawn'>()
    const runner = this.dataSource.createQueryRunner()
    await runner.connect()
    try {
      await runner.startTransaction('REPEATABLE READ')
      await runner.query(`DECLARE quotes NO SCROLL CURSOR FOR ${QUERY}`, [studyId])
      for (;;) {
        const batch: QuoteRow[] = await runner.query('FETCH 1000 FROM quotes')
        if (!batch.length) break
        const unknown = [...new Set(batch.map((r) => r.participant_id).filter((id) => !decided.has(id)))]
        for (const [id, use] of await this.consent.dataUseFor(studyId, unknown)) decided.set(id, use.mayQuote ? 'quote' : use.mayCode ? 'declined' : 'withdrawn')
        for (const row of batch) await visit(row, decided.get(row.participant_id) ?? 'withdrawn')
      }
      await runner.commitTransaction()
    } catch (error) {
      if (runner.isTransactionActive) await runner.rollbackTransaction()
      throw error
    } finally {
      await runner.release()
    }
  }

  async report(studyId: string): Promise<QuotesReport> {
    const { keys, label } = await this.labels(studyId)
    const themes: { id: string; name: string; status: string }[] = await this.dataSource.query(`SELECT id, name, status FROM themes WHERE study_id = $1 ORDER BY parent_id NULLS FIRST, position, id`, [studyId])
    const byTheme = new Map(themes.map((t) => [t.id, { ...t, quotes: [] as QuotesReport['themes'][number]['quotes'] }]))
    const leftOut = { declinedQuotation: 0, withdrawn: 0 }
    await this.walk(studyId, (row, verdict) => {
      if (verdict === 'declined') leftOut.declinedQuotation++
      else if (verdict === 'withdrawn') leftOut.withdrawn++
      else byTheme.get(row.theme_id)?.quotes.push({ text: row.text, pseudonym: row.pseudonym, characteristics: label(row.characteristics) })
    })
    return { themes: [...byTheme.values()], leftOut, labelCharacteristics: keys }
  }

  /** Writes the CSV to `out` as it goes (backpressure respected); the left-out counts come last. */
  async csv(studyId: string, out: Writable, bom: boolean): Promise<void> {
    const { label } = await this.labels(studyId)
    const write = async (chunk: string) => {
      if (!out.write(chunk)) await once(out, 'drain')
    }
    await write((bom ? '\uFEFF' : '') + csvRows([['theme', 'theme_status', 'pseudonym', 'characteristics', 'quote']]))
    const leftOut = { declined: 0, withdrawn: 0 }
    let lines: unknown[][] = []
    await this.walk(studyId, async (row, verdict) => {
      if (verdict === 'declined') leftOut.declined++
      else if (verdict === 'withdrawn') leftOut.withdrawn++
      else lines.push([row.theme_name, row.theme_status, row.pseudonym, label(row.characteristics).map((c) => `${c.label}: ${c.value}`).join('; '), row.text])
      if (lines.length >= 500) {
        await write(csvRows(lines))
        lines = []
      }
    })
    lines.push(['(left out, counts only)', '', '', 'participant did not agree to be quoted', excerpts(leftOut.declined)])
    lines.push(['(left out, counts only)', '', '', 'participant withdrew their data', excerpts(leftOut.withdrawn)])
    await write(csvRows(lines))
  }
}
