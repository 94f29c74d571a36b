/**
 * Fault drill: PostgreSQL restarted under load, and every app connection cut in the middle of a request.
 * The real server runs as a child process against a cluster of its own (tests/faults/support/drill.ts).
 *
 * security.md test 96 (pg_terminate_backend mid-request; ASVS 5.0 16.5.2, 16.5.3, 16.3.4; node-postgres #1707);
 * security.md test 97 (PostgreSQL stopped under load, then started; ASVS 5.0 16.5.2, 13.1.3);
 * security.md test 29 (session store down: 503, never served as anonymous; ASVS 5.0 16.5.3).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeTeam, TEST_PASSWORD } from '../support/factories.js'
import { DRILL_APPLICATION_NAME, startDrill, type Drill } from './support/drill.js'
import { Session, sleep, until, type Answer } from './support/http.js'

/** how long PostgreSQL stays down; FAULT_OUTAGE_SECONDS=60 gives the catalogue's full minute */
const OUTAGE_MS = Number(process.env.FAULT_OUTAGE_SECONDS ?? 5) * 1000
/** the longest any answer may take while the database is down (the pool's connect time-out is 5 s) */
const ANSWER_BOUND_MS = 6000
const STACK_TRACE = /\bat [\w.<>]+ \(|node_modules|\.ts:\d+|\.js:\d+/

type Kind = 'memo' | 'code' | 'read-study' | 'read-memos'
interface Sample extends Answer {
  who: string
  kind: Kind
  startedAt: number
  endedAt: number
  /** the id of the row a 2xx write created */
  id?: string
  marker?: string
}

let drill: Drill
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Session
let coder: Session
let coordinator: Session

beforeAll(async () => {
  drill = await startDrill('postgres')
  team = await makeTeam(drill.dataSource)
  ;[lead, coder, coordinator] = await Promise.all([
    Session.signIn(drill.app.url, team.users.lead.email, TEST_PASSWORD),
    Session.signIn(drill.app.url, team.users.coder.email, TEST_PASSWORD),
    Session.signIn(drill.app.url, team.users.coordinator.email, TEST_PASSWORD),
  ])
})

afterAll(async () => {
  await drill?.close()
})

const now = () => performance.now()

function problemIsReadable(a: Answer) {
  expect(a.contentType).toMatch(/^application\/problem\+json/)
  expect(a.body).toMatchObject({ status: 503, title: 'Service unavailable' })
  expect(a.body.detail).toMatch(/database is not reachable.*try again/i)
  expect(a.text).not.toMatch(STACK_TRACE)
}

describe('PostgreSQL restarted while signed-in users read and write (security.md test 97)', () => {
  it('keeps every acknowledged write, answers 503 with a readable message while down, and recovers by itself', async () => {
    const study = `/api/studies/${team.study.id}`
    const samples: Sample[] = []
    const health: { at: number; status: number; db: string | undefined; ms: number }[] = []
    let running = true
    let counter = 0

    async function loop(who: string, session: Session, kinds: Kind[]) {
      for (let i = 0; running; i++) {
        const kind = kinds[i % kinds.length]!
        const marker = `drill-${who}-${++counter}`
        const startedAt = now()
        let a: Answer
        if (kind === 'memo') a = await session.post(`${study}/memos`, { targetType: 'study', body: `Field note ${marker}` })
        else if (kind === 'code') a = await session.post(`${study}/codes`, { label: `Code ${marker}` })
        else if (kind === 'read-study') a = await session.get(study)
        else a = await session.get(`${study}/memos`)
        const write = kind === 'memo' || kind === 'code'
        samples.push({ ...a, who, kind, startedAt, endedAt: now(), marker: write ? marker : undefined, id: write && a.status === 201 ? a.body.id : undefined })
        await sleep(40)
      }
    }
    async function watchHealth() {
      while (running) {
        const started = now()
        const a = await new Session(drill.app.url).get('/api/health')
        health.push({ at: started, status: a.status, db: a.body?.db, ms: a.ms })
        await sleep(250)
      }
    }

    // an anonymous visitor fetches a CSRF token now and tries to sign in while the database is down
    const visitor = new Session(drill.app.url)
    visitor.csrf = (await visitor.get('/api/auth/csrf')).body.token

    const pid = drill.app.child!.pid
    const loops = [
      loop('coder', coder, ['memo', 'read-memos']),
      loop('lead', lead, ['code', 'read-study', 'memo']),
      loop('coordinator', coordinator, ['read-study']),
      watchHealth(),
    ]
    await sleep(3000)

    const stopAt = now()
    drill.postgres.stop()
    const stoppedAt = now()
    await sleep(OUTAGE_MS / 2)
    const login = await visitor.post('/api/auth/login', { email: team.users.coder.email, password: TEST_PASSWORD })
    await sleep(OUTAGE_MS / 2)
    const startAt = now()
    await drill.postgres.start()
    const upAt = now()

    // recovery: the first success of each user after PostgreSQL is back
    const firstSuccess = async (who: string) => {
      await until(() => samples.some((s) => s.who === who && s.startedAt >= upAt && s.status >= 200 && s.status < 300), 20_000, `${who} recovers`)
      return samples.find((s) => s.who === who && s.startedAt >= upAt && s.status >= 200 && s.status < 300)!.endedAt - upAt
    }
    const recovery = { coder: await firstSuccess('coder'), lead: await firstSuccess('lead'), coordinator: await firstSuccess('coordinator') }
    await until(() => health.some((h) => h.at >= upAt && h.status === 200), 20_000, 'health recovers')
    await sleep(3000)
    running = false
    await Promise.all(loops)

    const before = samples.filter((s) => s.endedAt < stopAt)
    const during = samples.filter((s) => s.startedAt >= stoppedAt && s.endedAt <= startAt)
    const straddling = samples.filter((s) => !before.includes(s) && !during.includes(s) && s.startedAt < upAt)
    const after = samples.filter((s) => s.startedAt >= upAt)
    const histogram = (list: Sample[]) => list.reduce<Record<string, number>>((h, s) => ({ ...h, [s.status]: (h[s.status] ?? 0) + 1 }), {})
    const acknowledged = samples.filter((s) => s.id)
    const rows = await drill.db.query<{ id: string }>(`SELECT id FROM memos WHERE id = ANY($1) UNION ALL SELECT id FROM codes WHERE id = ANY($1)`, [acknowledged.map((s) => s.id)])
    const refusedWrites = samples.filter((s) => s.marker && s.status === 503)
    const refusedStored = await drill.db.query(`SELECT 1 FROM memos WHERE body = ANY($1) UNION ALL SELECT 1 FROM codes WHERE label = ANY($2)`, [
      refusedWrites.map((s) => `Field note ${s.marker}`),
      refusedWrites.map((s) => `Code ${s.marker}`),
    ])
    const report = {
      outageMs: Math.round(startAt - stopAt),
      before: { n: before.length, statuses: histogram(before) },
      during: { n: during.length, statuses: histogram(during), slowestMs: Math.round(Math.max(0, ...during.map((s) => s.ms))) },
      straddling: { n: straddling.length, statuses: histogram(straddling) },
      after: { n: after.length, statuses: histogram(after) },
      acknowledgedWrites: acknowledged.length,
      refusedWrites: refusedWrites.length,
      refusedWritesThatWereStoredAnyway: refusedStored.rowCount,
      recoveryMs: Object.fromEntries(Object.entries(recovery).map(([k, v]) => [k, Math.round(v)])),
      healthFirstOkAfterStartMs: Math.round(health.find((h) => h.at >= upAt && h.status === 200)!.at - upAt),
      healthDuringOutage: health.filter((h) => h.at >= stoppedAt && h.at + h.ms <= startAt).map((h) => `${h.status} ${h.db}`).reduce<Record<string, number>>((c, k) => ({ ...c, [k]: (c[k] ?? 0) + 1 }), {}),
    }
    console.info('[fault drill] PostgreSQL restart:', JSON.stringify(report))

    // the process never died and was never restarted
    expect(drill.app.unexpectedExits).toEqual([])
    expect(drill.app.child?.pid).toBe(pid)
    // every write answered 2xx (before, around and after the outage) is in the database
    expect(before.filter((s) => s.status === 201).length).toBeGreaterThan(10)
    expect(rows.rowCount).toBe(acknowledged.length)
    // while PostgreSQL was down: only 503 problem details with a readable message, each within the bound
    expect(during.length).toBeGreaterThan(10)
    for (const s of during) {
      expect(s.failure, `${s.kind}: ${s.text}`).toBeUndefined()
      expect(s.status, `${s.kind}: ${s.text}`).toBe(503)
      problemIsReadable(s)
      expect(s.ms).toBeLessThan(ANSWER_BOUND_MS)
    }
    for (const s of straddling) expect([200, 201, 503], `${s.kind}: ${s.text}`).toContain(s.status)
    // nobody was signed in while the session store was down, and nobody was treated as signed out
    expect(login.status).toBe(503)
    problemIsReadable(login)
    expect(samples.filter((s) => s.status === 401 || s.status === 500)).toEqual([])
    // health said so, then recovered on its own
    const downHealth = health.filter((h) => h.at >= stoppedAt && h.at + h.ms <= startAt)
    expect(downHealth.length).toBeGreaterThan(0)
    for (const h of downHealth) expect([h.status, h.db]).toEqual([503, 'unreachable'])
    // back without restarting the app: the same sessions work again, within a few seconds
    for (const ms of Object.values(recovery)) expect(ms).toBeLessThan(5000)
    expect(after.length).toBeGreaterThan(10)
    expect(after.filter((s) => s.status >= 300)).toEqual([])
    // no request ended in the "unexpected error" branch (a 500), and the lost connections were reported
    expect(drill.app.logs.filter((l) => l.msg === 'unexpected error')).toEqual([])
    // and the app has not leaked connections: at most its pool of 10, the job queue's 4, and a few of pg-boss's own
    const { rows: connections } = await drill.db.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = 'drill' AND application_name <> $1`,
      [DRILL_APPLICATION_NAME],
    )
    expect(connections[0]!.n).toBeLessThanOrEqual(16)
  })
})

/**
 * Holds `lock` in a transaction of the drill's own, starts `request`, waits until the app's query is
 * blocked on that lock (the request is "in the middle"), then runs `whileBlocked` and lets go.
 */
async function whileRequestWaitsOnLock<T>(lock: string, table: string, request: () => Promise<Answer>, whileBlocked: () => Promise<T>, waiting = 1) {
  const holder = await drill.db.connect()
  try {
    await holder.query('BEGIN')
    await holder.query(lock)
    const pending = request()
    await until(async () => {
      // not on `holder`: inside a transaction pg_stat_activity is a snapshot taken at its first read
      const { rows } = await drill.db.query(
        `SELECT 1 FROM pg_stat_activity WHERE datname = 'drill' AND wait_event_type = 'Lock' AND application_name <> $1 AND query ILIKE $2`,
        [DRILL_APPLICATION_NAME, `%${table}%`],
      )
      return rows.length >= waiting
    }, 10_000, `${waiting} request(s) wait on a lock (${table || 'any table'})`)
    const result = await whileBlocked()
    return { result, pending }
  } finally {
    await holder.query('ROLLBACK').catch(() => {})
    holder.release()
  }
}

describe('every app connection cut while a request runs (security.md test 96)', () => {
  it('answers 503, rolls the transaction back, stays up, and serves the next request', async () => {
    const pid = drill.app.child!.pid
    const label = `Code cut-${Date.now()}`
    // The drill's lock stops audit rows being written, so the code's transaction runs its INSERT into
    // codes and then waits at its audit row: a request in the middle of its transaction.
    const { result: cut, pending } = await whileRequestWaitsOnLock(
      'LOCK TABLE audit_events IN SHARE MODE',
      'audit_events',
      () => lead.post(`/api/studies/${team.study.id}/codes`, { label }),
      () => drill.postgres.terminateAppConnections(),
    )
    const answer = await pending
    console.info('[fault drill] connections cut mid-transaction:', JSON.stringify({ connectionsTerminated: cut, status: answer.status, ms: Math.round(answer.ms), detail: answer.body?.detail }))
    expect(cut).toBeGreaterThan(0)
    expect(answer.status, answer.text).toBe(503)
    problemIsReadable(answer)
    // the INSERT into codes ran, but its transaction never committed
    const { rowCount } = await drill.db.query('SELECT 1 FROM codes WHERE label = $1', [label])
    expect(rowCount).toBe(0)
    // the process is the same one, and the next requests (same session) succeed
    expect(drill.app.unexpectedExits).toEqual([])
    expect(drill.app.child?.pid).toBe(pid)
    const retry = await lead.post(`/api/studies/${team.study.id}/codes`, { label })
    expect(retry.status, retry.text).toBe(201)
    expect((await coder.get(`/api/studies/${team.study.id}/memos`)).status).toBe(200)
    expect(drill.app.logs.some((l) => /database connection lost/.test(l.msg))).toBe(true)
  })

  it('a connection cut while the session is being read answers 503 and does not sign the user out (security.md test 29)', async () => {
    const user = await Session.signIn(drill.app.url, team.users.coder.email, TEST_PASSWORD)
    const sessions = () => drill.db.query(`SELECT 1 FROM session WHERE sess->'passport'->'user'->>'id' = $1`, [team.users.coder.id]).then((r) => r.rowCount)
    const before = await sessions()
    const { pending } = await whileRequestWaitsOnLock(
      'LOCK TABLE session IN ACCESS EXCLUSIVE MODE',
      'session',
      () => user.get(`/api/studies/${team.study.id}/memos`),
      async () => {
        await drill.postgres.terminateAppConnections()
        // the answer comes while the lock is still held: anything the app does to the session row at
        // the end of the response waits for the lock, and runs once it is let go
        return sleep(500)
      },
    )
    const answer = await pending
    expect(answer.status, answer.text).toBe(503)
    problemIsReadable(answer)
    await sleep(500)
    expect(await sessions()).toBe(before)
    const next = await user.get(`/api/studies/${team.study.id}/memos`)
    expect(next.status, next.text).toBe(200)
  })

  it('a pool exhausted by requests stuck on a lock answers the extra request 503 within the bound', async () => {
    const labels = Array.from({ length: 14 }, (_, i) => `Code queued-${Date.now()}-${i}`)
    const { result: extra, pending } = await whileRequestWaitsOnLock(
      'LOCK TABLE audit_events IN SHARE MODE',
      '',
      // every code waits for the study's codebook lock or the audit lock, holding a connection each
      () => Promise.all(labels.map((label) => lead.post(`/api/studies/${team.study.id}/codes`, { label }))).then((all) => all[0]!),
      () => coder.get(`/api/studies/${team.study.id}/memos`),
      10, // the app's pool holds 10 connections
    )
    await pending
    console.info('[fault drill] pool exhausted:', JSON.stringify({ status: extra.status, ms: Math.round(extra.ms), detail: extra.body?.detail }))
    expect(extra.failure, extra.text).toBeUndefined()
    expect(extra.status, extra.text).toBe(503)
    expect(extra.ms).toBeLessThan(ANSWER_BOUND_MS + 1000)
    expect(drill.app.logs.filter((l) => l.msg === 'unexpected error')).toEqual([])
  })
})
