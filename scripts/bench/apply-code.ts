/**
 * Applying a code under load: 20 coders, each signed in with their own session, create excerpts on
 * one approved transcript for a fixed time (autocannon, 20 connections, loopback). The same run drives
 * a bare Express POST endpoint as the baseline, so the throughput is printed as a ratio. Latency
 * percentiles come from every response's time (autocannon's own table has no p95). The server runs
 * in a child process (bench-server.ts) so the load generator does not share its event loop.
 */
import autocannon from 'autocannon'
import pg from 'pg'
import { hashPassword } from '../../server/modules/auth/passwords.js'
import { percentile, signIn, startServer, type Session } from './bench-clients.js'

const CODERS = 20
const SECONDS = Number(process.env.BENCH_SECONDS ?? 10)
const PACED_RATE = CODERS * 5

interface Run {
  requests: number
  perSecond: number
  p50: number
  p95: number
  p99: number
  errors: number
}

async function drive(port: number, path: string, headersFor: (client: number) => Record<string, string>, body: (() => string) | null, seconds = SECONDS, overallRate?: number): Promise<Run> {
  const times: number[] = []
  let clients = 0
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon(
      {
        url: `http://127.0.0.1:${port}`,
        connections: CODERS,
        duration: seconds,
        ...(overallRate ? { overallRate } : {}),
        requests: [body ? { method: 'POST', path, setupRequest: (req) => ({ ...req, body: body() }) } : { method: 'GET', path }],
        setupClient: (client) => {
          client.setHeaders({ 'content-type': 'application/json', ...headersFor(clients++ % CODERS) })
        },
      },
      (error, done) => (error ? reject(error) : resolve(done)),
    )
    instance.on('response', (_client: unknown, _status: number, _bytes: number, responseTime: number) => times.push(responseTime))
  })
  times.sort((a, b) => a - b)
  return {
    requests: result.requests.total,
    perSecond: result.requests.total / seconds,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    errors: result.errors + result.timeouts + result.non2xx,
  }
}

export async function runApplyCode(): Promise<void> {
  const server = await startServer()
  const db = new pg.Client({ connectionString: server.info.databaseUrl })
  await db.connect()
  try {
    const { studyId, appPort, basePort } = server.info
    const dataSource = { query: async (sql: string, params?: unknown[]) => (await db.query(sql, params)).rows }
    const env = { appPort, basePort, signIn: (email: string, password: string) => signIn(appPort, email, password) }
    const passwordHash = await hashPassword('bench coder passphrase for load')
    const users: { id: string }[] = await dataSource.query(
      `INSERT INTO users (email, name, password_hash) SELECT 'coder' || g || '@bench.test', 'Bench Coder ' || g, $1 FROM generate_series(1, ${CODERS}) g RETURNING id`,
      [passwordHash],
    )
    await dataSource.query(`INSERT INTO memberships (study_id, user_id, role) SELECT $1, unnest($2::uuid[]), 'coder'`, [studyId, users.map((u) => u.id)])
    const sessions: Session[] = []
    for (let i = 1; i <= CODERS; i++) sessions.push(await env.signIn(`coder${i}@bench.test`, 'bench coder passphrase for load'))
    const [transcript]: { id: string }[] = await dataSource.query(
      `SELECT t.id FROM transcripts t JOIN participants p ON p.id = t.participant_id WHERE t.study_id = $1 AND p.pseudonym = 'P02'`,
      [studyId],
    )
    const turns: { start_offset: number; end_offset: number; text: string }[] = await dataSource.query(`SELECT start_offset, end_offset, text FROM transcript_turns WHERE transcript_id = $1`, [transcript!.id])
    const codes: { id: string }[] = await dataSource.query(`SELECT id FROM codes WHERE study_id = $1 AND parent_id IS NOT NULL`, [studyId])
    let n = 0
    const body = () => {
      const turn = turns[n % turns.length]!
      const code = codes[n++ % codes.length]!
      return JSON.stringify({ start: turn.start_offset, end: turn.end_offset, text: turn.text, codeIds: [code.id] })
    }
    // warm up (one second): the approved text is read from the store once, then served from the cache
    await drive(env.appPort, `/api/studies/${studyId}/transcripts/${transcript!.id}/excerpts`, (i) => ({ cookie: sessions[i]!.cookie, 'x-csrf-token': sessions[i]!.csrf }), body, 1)
    const base = await drive(env.basePort, '/plain', () => ({}), body)
    const app = await drive(env.appPort, `/api/studies/${studyId}/transcripts/${transcript!.id}/excerpts`, (i) => ({ cookie: sessions[i]!.cookie, 'x-csrf-token': sessions[i]!.csrf }), body)
    // the same 20 coders at a steady 5 codes per second each (far faster than people code), not flat out
    const paced = await drive(env.appPort, `/api/studies/${studyId}/transcripts/${transcript!.id}/excerpts`, (i) => ({ cookie: sessions[i]!.cookie, 'x-csrf-token': sessions[i]!.csrf }), body, SECONDS, PACED_RATE)
    const me = await drive(env.appPort, '/api/auth/me', (i) => ({ cookie: sessions[i]!.cookie }), null)
    const stored: { n: number }[] = await dataSource.query(`SELECT count(*)::int AS n FROM excerpts WHERE transcript_id = $1`, [transcript!.id])
    console.log(`\nApplying a code: ${CODERS} coders (own sessions) for ${SECONDS} s each run, loopback; target p95 under 50 ms\n`)
    console.log(`${'endpoint'.padEnd(58)} ${'req/s'.padStart(8)} ${'p50 ms'.padStart(7)} ${'p95 ms'.padStart(7)} ${'p99 ms'.padStart(7)} ${'errors'.padStart(7)}`)
    for (const [name, run] of [['POST excerpts, flat out (session, guard, checks, insert)', app], [`POST excerpts at ${PACED_RATE}/s (5 per coder per second)`, paced], ['GET /api/auth/me (session and account only)', me], ['bare Express POST (baseline)', base]] as const) {
      console.log(`${name.padEnd(58)} ${run.perSecond.toFixed(0).padStart(8)} ${run.p50.toFixed(0).padStart(7)} ${run.p95.toFixed(0).padStart(7)} ${run.p99.toFixed(0).padStart(7)} ${String(run.errors).padStart(7)}`)
    }
    console.log(`throughput ratio (app / baseline): ${(app.perSecond / base.perSecond).toFixed(3)}; excerpts stored: ${stored[0]!.n}`)
  } finally {
    await db.end()
    await server.stop()
  }
}
