/**
 * Request throughput of the guarded, session-backed API against a baseline run side
 * by side in the same process, so the ratio shows what sessions, CSRF, the permission guard and
 * validation cost on this machine (absolute numbers vary between machines; the ratio much less).
 * Runs against a throw-away database on its own PostgreSQL cluster; bounded in count and time,
 * loopback only.
 */
import http from 'node:http'
import { startBenchEnvironment } from './bench-environment.js'

const REQUESTS = Number(process.env.BENCH_REQUESTS ?? 2000)
const CONCURRENCY = 8

/** Requests per second for `paths` (cycled through), REQUESTS in all, CONCURRENCY at a time. */
async function measure(port: number, paths: string | string[], headers: Record<string, string>): Promise<number> {
  const list = Array.isArray(paths) ? paths : [paths]
  const agent = new http.Agent({ keepAlive: true, maxSockets: CONCURRENCY })
  let next = 0
  const started = process.hrtime.bigint()
  const worker = async () => {
    while (next < REQUESTS) {
      const path = list[next % list.length]!
      next++
      await new Promise<void>((resolve, reject) => {
        const req = http.get({ host: '127.0.0.1', port, path, headers, agent }, (res) => {
          if (res.statusCode !== 200) reject(new Error(`${path} answered ${res.statusCode}`))
          res.resume()
          res.on('end', () => resolve())
        })
        req.on('error', reject)
      })
    }
  }
  await Promise.all(Array.from({ length: CONCURRENCY }, worker))
  agent.destroy()
  const seconds = Number(process.hrtime.bigint() - started) / 1e9
  return REQUESTS / seconds
}

/** Runs the API benchmark on its own throw-away cluster. */
export async function runApiThroughput(): Promise<void> {
  const env = await startBenchEnvironment()
  try {
    const { appPort, basePort, dataSource, studyId } = env
    const { cookie } = await env.signIn('lead@heardwell.test')

    // 5,000 participants with contact records, to list page by page as a coordinator's table does
    await dataSource.query(
      `WITH s AS (UPDATE studies SET participant_sequence = participant_sequence + 5000 WHERE id = $1 RETURNING participant_sequence - 5000 AS start)
       INSERT INTO participants (study_id, sequence, pseudonym, status, source, characteristics)
       SELECT $1, s.start + g, 'P' || lpad((s.start + g)::text, 4, '0'), (ARRAY['eligible','not_eligible','screening','enquired'])[1 + g % 4], 'public_page',
              jsonb_build_object('region', (ARRAY['north','coast','valley'])[1 + g % 3])
         FROM s, generate_series(1, 5000) g`,
      [studyId],
    )
    await dataSource.query(
      `INSERT INTO participant_contacts (participant_id, name, email)
       SELECT p.id, 'Bench Person ' || p.sequence, 'bench' || p.sequence || '@example.org' FROM participants p
        WHERE p.study_id = $1 AND NOT EXISTS (SELECT 1 FROM participant_contacts c WHERE c.participant_id = p.id)`,
      [studyId],
    )
    const base = await measure(basePort, '/plain', {})
    const pageSize = 100
    const pages = Array.from({ length: 5000 / pageSize }, (_, i) => `/api/studies/${studyId}/participants?page=${i + 1}&pageSize=${pageSize}&sortBy=pseudonym`)
    const rows: [string, number][] = [
      ['GET /api/auth/me (session + account)', await measure(appPort, '/api/auth/me', { cookie })],
      ['GET /api/studies/:id/members (guard + query)', await measure(appPort, `/api/studies/${studyId}/members`, { cookie })],
      [`participants list, 5,000 in pages of ${pageSize}`, await measure(appPort, pages, { cookie })],
    ]
    console.log(`\n${REQUESTS} requests each, ${CONCURRENCY} at a time, loopback; the participants list cycles through all 5,000 rows\n`)
    console.log(`${'route'.padEnd(48)} ${'req/s'.padStart(8)}  ${'baseline req/s'.padStart(14)}  ratio`)
    for (const [name, rate] of rows) {
      console.log(`${name.padEnd(48)} ${rate.toFixed(0).padStart(8)}  ${base.toFixed(0).padStart(14)}  ${(rate / base).toFixed(3)}`)
    }
  } finally {
    await env.close()
  }
}
