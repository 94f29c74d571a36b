/**
 * Streaming a large export: quotes by theme with 20,000 supporting excerpts (and 10,000, to show that
 * memory stays flat as the export grows). Prints the time and the server's peak heap growth while
 * streaming, beside a baseline in the same run: a bare Express endpoint writing the same number of
 * CSV rows from memory. Target: under two seconds for 20,000, and flat memory.
 */
import { startBenchEnvironment } from './bench-environment.js'

const SIZES = [10_000, 20_000]

async function timed(url: string, cookie: string): Promise<{ ms: number; bytes: number; peakHeapMb: number }> {
  global.gc?.()
  const base = process.memoryUsage().heapUsed
  let peak = base
  const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().heapUsed)), 5)
  const started = performance.now()
  const res = await fetch(url, { headers: { cookie } })
  if (res.status !== 200) throw new Error(`${url}: ${res.status}`)
  let bytes = 0
  for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
    bytes += chunk.length
    peak = Math.max(peak, process.memoryUsage().heapUsed)
  }
  const ms = performance.now() - started
  clearInterval(sampler)
  return { ms, bytes, peakHeapMb: (peak - base) / 1_048_576 }
}

export async function runQuotesExport(): Promise<void> {
  const env = await startBenchEnvironment()
  try {
    const { dataSource, studyId } = env
    const { cookie } = await env.signIn('lead@heardwell.test')
    const sample: { id: string; transcript_id: string; participant_id: string; coder_id: string; start_offset: number; end_offset: number; text: string }[] = await dataSource.query(
      `SELECT e.id, e.transcript_id, e.participant_id, e.coder_id, e.start_offset, e.end_offset, e.text FROM excerpts e JOIN participants p ON p.id = e.participant_id
        WHERE e.study_id = $1 AND p.pseudonym <> 'P08' ORDER BY e.created_at LIMIT 40`,
      [studyId],
    )
    const rows: string[] = []
    for (const size of SIZES) {
      const [theme]: { id: string }[] = await dataSource.query(`INSERT INTO themes (study_id, name, plain_description, position) VALUES ($1, $2, 'Bench theme.', 100) RETURNING id`, [studyId, `Bench ${size}`])
      // copies of real excerpts (same transcripts and participants), each its own row
      await dataSource.query(
        `WITH src AS (SELECT * FROM excerpts WHERE id = ANY($2::uuid[])),
              made AS (INSERT INTO excerpts (study_id, transcript_id, participant_id, coder_id, start_offset, end_offset, text)
                       SELECT s.study_id, s.transcript_id, s.participant_id, s.coder_id, s.start_offset, s.end_offset, s.text || ' (' || g || ')'
                         FROM generate_series(1, $3::int) g JOIN src s ON s.id = ($2::uuid[])[1 + g % cardinality($2::uuid[])] RETURNING id)
         INSERT INTO theme_excerpts (theme_id, excerpt_id, share_with_partners, position) SELECT $1, id, false, row_number() OVER () FROM made`,
        [theme!.id, sample.map((s) => s.id), size],
      )
      const app = await timed(`http://127.0.0.1:${env.appPort}/api/studies/${studyId}/exports/quotes-by-theme.csv`, cookie)
      const base = await timed(`http://127.0.0.1:${env.basePort}/rows?n=${size}`, '')
      rows.push(`${String(size).padEnd(10)} ${app.ms.toFixed(0).padStart(8)} ${app.peakHeapMb.toFixed(1).padStart(14)} ${(app.bytes / 1_048_576).toFixed(1).padStart(8)} ${base.ms.toFixed(0).padStart(12)}  ${(app.ms / base.ms).toFixed(1)}`)
      await dataSource.query(`DELETE FROM themes WHERE id = $1`, [theme!.id])
    }
    console.log('\nQuotes by theme, streamed as CSV (all themes of the demo plus one bench theme); target under 2 s for 20,000 and flat memory\n')
    console.log(`${'excerpts'.padEnd(10)} ${'ms'.padStart(8)} ${'peak heap MB'.padStart(14)} ${'CSV MB'.padStart(8)} ${'baseline ms'.padStart(12)}  ratio`)
    for (const row of rows) console.log(row)
    console.log('baseline: a bare Express endpoint writing the same number of CSV rows from memory; peak heap is the growth while streaming')
  } finally {
    await env.close()
  }
}
