/**
 * Load: 50 people signed in at once, each with their own session, reading and coding the demo study
 * for a fixed time (autocannon, one connection per person, loopback). 40 coders, 5 leads and
 * 5 coordinators. Each person picks their next request at random by these weights (a seeded
 * generator per person, so runs are comparable):
 *
 *   coders and leads, 80 % reads: study overview 10, codebook 15, transcript list 10, a transcript's
 *     codable text 15, their excerpts on a transcript 15, memos 7 (study-wide or on a transcript),
 *     themes 7, inter-coder agreement 1;
 *   20 % writes: create an excerpt with one code 14, recode or resize one of their excerpts 4,
 *     remove one of their excerpts 2 (both fall back to creating when the person has none yet);
 *   coordinators, reads only (their role neither reads nor writes coding): study overview 30,
 *     transcript list 30, a transcript's codable text 40.
 *
 * Overall about 82 % reads and 18 % writes. Writes carry the session's CSRF token, and every range is
 * cut from the approved text as the browser would send it (grapheme-snapped, trimmed, with its quote).
 * Any answer other than 2xx is an error and is printed by status and request.
 *
 * The same run drives the bare Express GET /plain (no session, no database) with the same 50
 * connections as the base of the throughput ratio. Targets: no errors, p95 under 100 ms, throughput at
 * least a quarter of the bare endpoint's. A paced run (2 requests per person per second, already far
 * busier than people reading and coding) follows the flat-out one. The server runs in a child process
 * (bench-server.ts); BENCH_PROFILE=<dir> writes its CPU profile there, and BENCH_STATEMENTS=1 prints the statements
 * that cost PostgreSQL the most in the flat-out run (pg_stat_statements).
 */
import { readdirSync, readFileSync } from 'node:fs'
import autocannon from 'autocannon'
import pg from 'pg'
import { normaliseRange } from '../../shared/coding/offsets.js'
import { hashPassword } from '../../server/modules/auth/passwords.js'
import { percentile, signIn, startServer, type Session } from './bench-clients.js'

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10)
const PASSWORD = 'bench load passphrase for everyone'
const ROLES = [...Array<'coder'>(40).fill('coder'), ...Array<'lead'>(5).fill('lead'), ...Array<'coordinator'>(5).fill('coordinator')]
const USERS = ROLES.length
const PACED_PER_PERSON = 2
const TARGET_P95_MS = 100
const TARGET_RATIO = 0.25

type Role = (typeof ROLES)[number]
type Kind = 'overview' | 'codebook' | 'transcripts' | 'transcript' | 'excerpts' | 'memos' | 'themes' | 'agreement' | 'create' | 'update' | 'remove'
const WRITES: readonly Kind[] = ['create', 'update', 'remove']

const CODING_MIX: [Kind, number][] = [
  ['overview', 10], ['codebook', 15], ['transcripts', 10], ['transcript', 15], ['excerpts', 15], ['memos', 7], ['themes', 7], ['agreement', 1],
  ['create', 14], ['update', 4], ['remove', 2],
]
const COORDINATOR_MIX: [Kind, number][] = [['overview', 30], ['transcripts', 30], ['transcript', 40]]

interface Transcript {
  id: string
  text: string
  turns: { start: number; end: number }[]
}
interface MyExcerpt {
  id: string
  version: number
  transcriptId: string
  start: number
  end: number
}
interface Person {
  id: string
  role: Role
  session: Session
  random: () => number
  mine: MyExcerpt[]
  /** what the request in flight is (one connection per person, no pipelining: one at a time) */
  pending: { kind: Kind; excerpt?: MyExcerpt }
}

interface Run {
  seconds: number
  requests: number
  perSecond: number
  p50: number
  p95: number
  p99: number
  errors: number
  /** non-2xx answers by "status kind", plus socket errors and timeouts */
  failures: Map<string, number>
  byKind: Map<Kind, number[]>
  /** CPU milliseconds per answered request in the server process and in PostgreSQL (Linux only) */
  cpu?: { server: number; postgres: number }
}

/** mulberry32: a small seeded generator, so each person makes the same choices in every run */
function seeded(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

function pick<T>(random: () => number, items: readonly T[]): T {
  return items[Math.floor(random() * items.length)]!
}

function weighted(random: () => number, mix: [Kind, number][]): Kind {
  const total = mix.reduce((sum, [, w]) => sum + w, 0)
  let r = random() * total
  for (const [kind, w] of mix) if ((r -= w) < 0) return kind
  return mix[mix.length - 1]![0]
}

/**
 * CPU seconds (user + system) used so far by the server process and by the bench's PostgreSQL (its
 * postmaster, the backends it has reaped, and the live ones), from /proc: work per request is a
 * steadier figure than latency on a shared machine. Null where there is no /proc.
 */
function cpuSeconds(serverPid: number, pgPort: number): { server: number; postgres: number } | null {
  const tick = 100 // USER_HZ on Linux
  const stat = (pid: number | string) => {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').replace(/^.*\) /, '').split(' ')
    return { ppid: Number(fields[1]), own: (Number(fields[11]) + Number(fields[12])) / tick, reaped: (Number(fields[13]) + Number(fields[14])) / tick }
  }
  try {
    const server = stat(serverPid).own
    const pids = readdirSync('/proc').filter((name) => /^\d+$/.test(name))
    const postmaster = pids.find((pid) => {
      try {
        const cmd = readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0')
        const p = cmd.indexOf('-p')
        return cmd[0]!.endsWith('/postgres') && p > 0 && cmd[p + 1] === String(pgPort)
      } catch {
        return false
      }
    })
    if (!postmaster) return { server, postgres: NaN }
    const main = stat(postmaster)
    let postgres = main.own + main.reaped
    for (const pid of pids) {
      try {
        const child = stat(pid)
        if (child.ppid === Number(postmaster)) postgres += child.own
      } catch {
        // gone meanwhile
      }
    }
    return { server, postgres }
  } catch {
    return null
  }
}

async function getJson<T>(port: number, path: string, session: Session): Promise<T> {
  const res = await fetch(`http://127.0.0.1:${port}${path}`, { headers: { cookie: session.cookie } })
  if (res.status !== 200) throw new Error(`GET ${path}: ${res.status}`)
  return (await res.json()) as T
}

/** The study's world as the load needs it: approved transcripts with their text and turns, active codes. */
interface World {
  studyId: string
  transcripts: Transcript[]
  codeIds: string[]
}

/** The next request of one person: method, path and body, valid for their role and their own excerpts. */
function nextRequest(person: Person, world: World): { method: string; path: string; body?: string } {
  const { random } = person
  const study = `/api/studies/${world.studyId}`
  let kind = weighted(random, person.role === 'coordinator' ? COORDINATOR_MIX : CODING_MIX)
  if ((kind === 'update' || kind === 'remove') && !person.mine.length) kind = 'create'
  person.pending = { kind }
  const transcript = pick(random, world.transcripts)
  switch (kind) {
    case 'overview':
      return { method: 'GET', path: study }
    case 'codebook':
      return { method: 'GET', path: `${study}/codes` }
    case 'transcripts':
      return { method: 'GET', path: `${study}/transcripts` }
    case 'transcript':
      return { method: 'GET', path: `${study}/transcripts/${transcript.id}` }
    case 'excerpts':
      return { method: 'GET', path: `${study}/transcripts/${transcript.id}/excerpts` }
    case 'memos':
      return { method: 'GET', path: random() < 0.5 ? `${study}/memos` : `${study}/memos?targetType=transcript&targetId=${transcript.id}` }
    case 'themes':
      return { method: 'GET', path: `${study}/themes` }
    case 'agreement':
      return { method: 'GET', path: `${study}/agreement` }
    case 'create': {
      const range = rangeIn(random, transcript)
      const body = { start: range.start, end: range.end, text: transcript.text.slice(range.start, range.end), codeIds: [pick(random, world.codeIds)] }
      return { method: 'POST', path: `${study}/transcripts/${transcript.id}/excerpts`, body: JSON.stringify(body) }
    }
    case 'update': {
      const excerpt = pick(random, person.mine)
      person.pending.excerpt = excerpt
      if (random() < 0.5) return { method: 'PATCH', path: `${study}/excerpts/${excerpt.id}`, body: JSON.stringify({ version: excerpt.version, codeIds: [pick(random, world.codeIds)] }) }
      // resize: grow the excerpt to its whole turn (or shrink it back to a part of it)
      const own = world.transcripts.find((t) => t.id === excerpt.transcriptId)!
      const turn = own.turns.find((t) => t.start <= excerpt.start && excerpt.end <= t.end) ?? own.turns[0]!
      const range = turn.start === excerpt.start && turn.end === excerpt.end ? rangeIn(random, own, turn) : normaliseRange(own.text, turn.start, turn.end)!
      return { method: 'PATCH', path: `${study}/excerpts/${excerpt.id}`, body: JSON.stringify({ version: excerpt.version, start: range.start, end: range.end, text: own.text.slice(range.start, range.end) }) }
    }
    case 'remove': {
      const excerpt = pick(random, person.mine)
      person.pending.excerpt = excerpt
      return { method: 'DELETE', path: `${study}/excerpts/${excerpt.id}?version=${excerpt.version}` }
    }
  }
}

/** A passage of a few words to a whole turn, as a selection in the browser would give it. */
function rangeIn(random: () => number, transcript: Transcript, turn = pick(random, transcript.turns)): { start: number; end: number } {
  const length = turn.end - turn.start
  const from = turn.start + Math.floor(random() * length * 0.5)
  const to = from + 20 + Math.floor(random() * (turn.end - from))
  return normaliseRange(transcript.text, from, Math.min(to, turn.end)) ?? normaliseRange(transcript.text, turn.start, turn.end)!
}

/** What the person learns from an answer: new excerpts to change later, new versions, removed ones. */
function learn(person: Person, status: number, body: string): void {
  const { kind, excerpt } = person.pending
  if (kind === 'create' && status === 201) {
    const made = JSON.parse(body) as { id: string; version: number; transcriptId: string; start: number; end: number }
    person.mine.push({ id: made.id, version: made.version, transcriptId: made.transcriptId, start: made.start, end: made.end })
  } else if (kind === 'update' && excerpt && status === 200) {
    const saved = JSON.parse(body) as { version: number; start: number; end: number }
    Object.assign(excerpt, { version: saved.version, start: saved.start, end: saved.end })
  } else if (kind === 'remove' && excerpt && status === 204) {
    person.mine.splice(person.mine.indexOf(excerpt), 1)
  }
}

/** Every person on their own connection, flat out or at an overall rate; latency from every answer. */
async function driveApp(port: number, people: Person[], world: World, seconds: number, overallRate?: number): Promise<Run> {
  const times: number[] = []
  const byKind = new Map<Kind, number[]>()
  const failures = new Map<string, number>()
  let next = 0
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    autocannon(
      {
        url: `http://127.0.0.1:${port}`,
        connections: people.length,
        duration: seconds,
        ...(overallRate ? { overallRate } : {}),
        setupClient: (client) => {
          const person = people[next++ % people.length]!
          const headers = { cookie: person.session.cookie, 'x-csrf-token': person.session.csrf, 'content-type': 'application/json' }
          client.setHeaders(headers)
          client.setRequests([
            {
              setupRequest: (req) => {
                const { method, path, body } = nextRequest(person, world)
                // a fresh headers object each time: the builder adds Content-Length to the one it is given
                return { ...req, method: method as 'GET', path, headers: { ...headers }, body: body ?? '' }
              },
              onResponse: (status, body) => learn(person, status, body),
            },
          ])
          client.on('response', (status: number, _bytes: number, responseTime: number) => {
            const kind = person.pending.kind
            times.push(responseTime)
            const list = byKind.get(kind) ?? []
            list.push(responseTime)
            byKind.set(kind, list)
            if (status < 200 || status >= 300) failures.set(`${status} ${kind}`, (failures.get(`${status} ${kind}`) ?? 0) + 1)
          })
        },
      },
      (error, done) => (error ? reject(error) : resolve(done)),
    )
  })
  if (result.errors) failures.set('socket errors', result.errors)
  if (result.timeouts) failures.set('timeouts', result.timeouts)
  return summarise(result, seconds, times, failures, byKind)
}

/** The bare Express endpoint with the same connection count. */
async function driveBaseline(port: number, connections: number, seconds: number): Promise<Run> {
  const times: number[] = []
  const failures = new Map<string, number>()
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon({ url: `http://127.0.0.1:${port}/plain`, connections, duration: seconds }, (error, done) => (error ? reject(error) : resolve(done)))
    instance.on('response', (_client: unknown, status: number, _bytes: number, responseTime: number) => {
      times.push(responseTime)
      if (status < 200 || status >= 300) failures.set(`${status} plain`, (failures.get(`${status} plain`) ?? 0) + 1)
    })
  })
  if (result.errors) failures.set('socket errors', result.errors)
  if (result.timeouts) failures.set('timeouts', result.timeouts)
  return summarise(result, seconds, times, failures, new Map())
}

function summarise(result: autocannon.Result, seconds: number, times: number[], failures: Map<string, number>, byKind: Map<Kind, number[]>): Run {
  times.sort((a, b) => a - b)
  for (const list of byKind.values()) list.sort((a, b) => a - b)
  return {
    seconds,
    requests: times.length,
    perSecond: times.length / seconds,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    errors: [...failures.values()].reduce((sum, n) => sum + n, 0),
    failures,
    byKind,
  }
}

function row(name: string, run: Run): string {
  const n = (v: number, w: number) => v.toFixed(0).padStart(w)
  return `${name.padEnd(46)} ${n(run.perSecond, 8)} ${n(run.p50, 7)} ${n(run.p95, 7)} ${n(run.p99, 7)} ${String(run.errors).padStart(7)}`
}

/** BENCH_STATEMENTS=1: the statements that cost PostgreSQL the most since the last reset (pg_stat_statements). */
async function costliestStatements(db: pg.Client, requests: number): Promise<{ query: string; perRequest: number; callsPerRequest: number; perCall: number; planShare: number; rowsPerCall: number }[]> {
  const { rows } = await db.query<{ query: string; calls: string; time: number; plan: number; rows: string }>(
    `SELECT query, calls, total_plan_time + total_exec_time AS time, total_plan_time AS plan, rows FROM pg_stat_statements
      WHERE dbid = (SELECT oid FROM pg_database WHERE datname = current_database()) ORDER BY time DESC LIMIT 25`,
  )
  const n = Math.max(1, requests)
  return rows.map((r) => ({
    query: r.query.replace(/\s+/g, ' ').slice(0, 160),
    perRequest: r.time / n,
    callsPerRequest: Number(r.calls) / n,
    perCall: r.time / Math.max(1, Number(r.calls)),
    planShare: r.time ? r.plan / r.time : 0,
    rowsPerCall: Number(r.rows) / Math.max(1, Number(r.calls)),
  }))
}

export async function runLoad(): Promise<void> {
  const server = await startServer()
  const db = new pg.Client({ connectionString: server.info.databaseUrl })
  await db.connect()
  try {
    const { studyId, appPort, basePort } = server.info
    const passwordHash = await hashPassword(PASSWORD)
    const users = (
      await db.query<{ id: string }>(
        `INSERT INTO users (email, name, password_hash) SELECT 'load' || g || '@bench.test', 'Load Person ' || g, $1 FROM generate_series(1, ${USERS}) g ORDER BY g RETURNING id`,
        [passwordHash],
      )
    ).rows
    await db.query(`INSERT INTO memberships (study_id, user_id, role) SELECT $1, unnest($2::uuid[]), unnest($3::text[])`, [studyId, users.map((u) => u.id), ROLES])
    const people: Person[] = []
    for (let i = 0; i < USERS; i++) {
      people.push({ id: users[i]!.id, role: ROLES[i]!, session: await signIn(appPort, `load${i + 1}@bench.test`, PASSWORD), random: seeded(i + 1), mine: [], pending: { kind: 'overview' } })
    }
    const reader = people[0]!.session
    const listed = await getJson<{ transcripts: { id: string; status: string }[] }>(appPort, `/api/studies/${studyId}/transcripts`, reader)
    const transcripts: Transcript[] = []
    for (const t of listed.transcripts.filter((x) => x.status === 'approved')) {
      const read = await getJson<{ text: string; turns: { start: number; end: number }[] }>(appPort, `/api/studies/${studyId}/transcripts/${t.id}`, reader)
      transcripts.push({ id: t.id, text: read.text, turns: read.turns.filter((turn) => turn.end - turn.start >= 40) })
    }
    const codes = (await db.query<{ id: string }>(`SELECT id FROM codes WHERE study_id = $1 AND status = 'active' ORDER BY label`, [studyId])).rows
    if (!transcripts.length || !codes.length) throw new Error('the demo study has no approved transcript or no active code')
    const world: World = { studyId, transcripts, codeIds: codes.map((c) => c.id) }
    const before = (await db.query<{ n: number }>(`SELECT count(*)::int AS n FROM excerpts WHERE study_id = $1`, [studyId])).rows[0]!.n

    const pgPort = Number(new URL(server.info.databaseUrl).port)
    /**
     * One run, with the CPU it cost. Answers still in flight when a run stops are never seen, so once the
     * database has been idle for a second each person's own excerpts are read back from it (else the
     * next run would send stale versions and count the bench's own mistake as a 409).
     */
    const measured = async (run: () => Promise<Run>): Promise<Run> => {
      const start = cpuSeconds(server.pid, pgPort)
      const result = await run()
      const end = cpuSeconds(server.pid, pgPort)
      if (start && end && result.requests) result.cpu = { server: (1000 * (end.server - start.server)) / result.requests, postgres: (1000 * (end.postgres - start.postgres)) / result.requests }
      for (let idle = 0; idle < 5; ) {
        await new Promise((resolve) => setTimeout(resolve, 200))
        const busy = (await db.query<{ n: number }>(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND state <> 'idle' AND pid <> pg_backend_pid()`)).rows[0]!.n
        idle = busy ? 0 : idle + 1
      }
      const rows = (await db.query<{ id: string; coder_id: string; transcript_id: string; start_offset: number; end_offset: number; version: number }>(
        `SELECT id, coder_id, transcript_id, start_offset, end_offset, version FROM excerpts WHERE coder_id = ANY($1::uuid[])`,
        [people.map((p) => p.id)],
      )).rows
      for (const person of people) person.mine = rows.filter((r) => r.coder_id === person.id).map((r) => ({ id: r.id, version: r.version, transcriptId: r.transcript_id, start: r.start_offset, end: r.end_offset }))
      return result
    }

    // warm up (two seconds): approved texts into the cache, connection pools filled, code paths compiled
    await measured(() => driveApp(appPort, people, world, 2))
    await driveBaseline(basePort, USERS, 2)
    const base = await measured(() => driveBaseline(basePort, USERS, SECONDS))
    if (process.env.BENCH_STATEMENTS) await db.query('SELECT pg_stat_statements_reset()')
    const app = await measured(() => driveApp(appPort, people, world, SECONDS))
    const statements = process.env.BENCH_STATEMENTS ? await costliestStatements(db, app.requests) : []
    const paced = await measured(() => driveApp(appPort, people, world, SECONDS, USERS * PACED_PER_PERSON))
    const after = (await db.query<{ n: number }>(`SELECT count(*)::int AS n FROM excerpts WHERE study_id = $1`, [studyId])).rows[0]!.n

    const writes = [...app.byKind].filter(([k]) => WRITES.includes(k)).reduce((sum, [, l]) => sum + l.length, 0)
    console.log(`\nLoad: ${USERS} people signed in (${ROLES.filter((r) => r === 'coder').length} coders, ${ROLES.filter((r) => r === 'lead').length} leads, ${ROLES.filter((r) => r === 'coordinator').length} coordinators), one connection each, ${SECONDS} s per run, loopback`)
    console.log(`mix as sent flat out: ${((100 * (app.requests - writes)) / Math.max(1, app.requests)).toFixed(0)} % reads, ${((100 * writes) / Math.max(1, app.requests)).toFixed(0)} % writes (create/recode/resize/remove excerpts); ${transcripts.length} approved transcripts, ${codes.length} active codes\n`)
    console.log(`${'run'.padEnd(46)} ${'req/s'.padStart(8)} ${'p50 ms'.padStart(7)} ${'p95 ms'.padStart(7)} ${'p99 ms'.padStart(7)} ${'errors'.padStart(7)}`)
    console.log(row('mixed reading and coding, flat out', app))
    console.log(row(`mixed, paced at ${USERS * PACED_PER_PERSON}/s (${PACED_PER_PERSON} per person per second)`, paced))
    console.log(row(`bare Express GET /plain (baseline, ${USERS} conns)`, base))

    console.log('\nflat out, by request:')
    console.log(`${'request'.padEnd(22)} ${'share'.padStart(6)} ${'p50 ms'.padStart(7)} ${'p95 ms'.padStart(7)} ${'p99 ms'.padStart(7)}`)
    for (const [kind, list] of [...app.byKind].sort((a, b) => b[1].length - a[1].length)) {
      console.log(`${kind.padEnd(22)} ${`${((100 * list.length) / app.requests).toFixed(1)}%`.padStart(6)} ${percentile(list, 50).toFixed(0).padStart(7)} ${percentile(list, 95).toFixed(0).padStart(7)} ${percentile(list, 99).toFixed(0).padStart(7)}`)
    }
    for (const [name, run] of [['flat out', app], ['paced', paced], ['baseline', base]] as const) {
      if (run.failures.size) console.log(`errors (${name}): ${[...run.failures].map(([what, n]) => `${what}: ${n}`).join(', ')}`)
    }

    if (app.cpu && base.cpu) {
      const ms = (v: number) => (Number.isFinite(v) ? v.toFixed(2) : '?')
      console.log(`\nCPU per request (ms): flat out server ${ms(app.cpu.server)} + PostgreSQL ${ms(app.cpu.postgres)}; paced server ${ms(paced.cpu!.server)} + PostgreSQL ${ms(paced.cpu!.postgres)}; bare endpoint ${ms(base.cpu.server)}`)
    }
    if (statements.length) {
      console.log('\nPostgreSQL statements of the flat-out run by time (planning + execution), per answered request:')
      console.log(`${'ms/req'.padStart(7)} ${'calls/req'.padStart(9)} ${'ms/call'.padStart(8)} ${'planning'.padStart(8)} ${'rows/call'.padStart(9)}  statement`)
      for (const s of statements) console.log(`${s.perRequest.toFixed(3).padStart(7)} ${s.callsPerRequest.toFixed(2).padStart(9)} ${s.perCall.toFixed(3).padStart(8)} ${`${(100 * s.planShare).toFixed(0)}%`.padStart(8)} ${s.rowsPerCall.toFixed(1).padStart(9)}  ${s.query}`)
    }
    const ratio = app.perSecond / base.perSecond
    const verdict = (ok: boolean) => (ok ? 'PASS' : 'MISS')
    console.log(`\nexcerpts written during the runs: ${after - before}`)
    console.log(`throughput ratio (flat out / bare endpoint): ${ratio.toFixed(3)}`)
    console.log(`${verdict(app.errors + paced.errors === 0)}  no errors (flat out ${app.errors}, paced ${paced.errors})`)
    console.log(`${verdict(app.p95 < TARGET_P95_MS)}  p95 under ${TARGET_P95_MS} ms flat out (${app.p95.toFixed(0)} ms; paced ${paced.p95.toFixed(0)} ms)`)
    console.log(`${verdict(ratio >= TARGET_RATIO)}  throughput at least ${TARGET_RATIO} of the bare endpoint (${ratio.toFixed(3)})`)
  } finally {
    await db.end()
    await server.stop()
  }
}
