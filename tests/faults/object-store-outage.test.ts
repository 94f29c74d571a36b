/**
 * Fault drill: the object store stops during uploads (transcript, consent form version, interview guide),
 * and the database fails after a file was already stored. The real server runs as a child process with
 * a fake S3 of its own that the drill stops and starts on the same port (tests/faults/support/drill.ts).
 *
 * security.md test 98 (object store down during upload: 503, no usable row, no temp file; ASVS 5.0 16.5.2, 16.5.3, 2.3.3);
 * security.md test 99 (database fails after a successful object PUT: compensating delete, no orphans; ASVS 5.0 2.3.3, 14.2.7).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makePdf, uploadForm, FORM_V1 } from '../support/consent.js'
import { makeTeam, uniqueEmail } from '../support/factories.js'
import { consentedParticipant, doneInterview, uploadTranscript } from '../support/interviews.js'
import { openRecruitment } from '../support/recruitment.js'
import type { Client } from '../support/test-app.js'
import { DRILL_APPLICATION_NAME, signedInClient, startDrill, type Drill } from './support/drill.js'
import { until } from './support/http.js'

const STACK_TRACE = /\bat [\w.<>]+ \(|node_modules|\.ts:\d+|\.js:\d+/
const TRANSCRIPT = Buffer.from('Interviewer: How were the first weeks at home?\nP: Slow. The stairs were the hardest part.\n')

let drill: Drill
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
let coordinator: Client
let base: string


beforeAll(async () => {
  drill = await startDrill('s3')
  team = await makeTeam(drill.dataSource)
  lead = await signedInClient(drill, team.users.lead.email)
  coordinator = await signedInClient(drill, team.users.coordinator.email)
  base = `/api/studies/${team.study.id}`
  await openRecruitment(lead, team.study.id)
})

afterAll(async () => {
  await drill?.close()
})

/** a done interview whose participant's consent allows a transcript (needs the object store up) */
async function interviewReadyForTranscript(name: string) {
  const pid = await consentedParticipant(coordinator, lead, team.study.id, name, uniqueEmail('s3'))
  return doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
}

function uploadGuide(label: string, pdf: Buffer) {
  return lead.agent
    .post(`${base}/interview-guides`)
    .set('X-CSRF-Token', lead.csrf)
    .field('metadata', JSON.stringify({ label, approvalDate: '2026-03-01', text: 'Tell me about the first week at home.' }))
    .attach('file', pdf, `guide-${label}.pdf`)
}

/** every key the database refers to; anything else in the bucket is an orphan */
async function referencedKeys(): Promise<Set<string>> {
  const { rows } = await drill.db.query<{ key: string }>(`
    SELECT quarantine_prefix || '/upload' AS key FROM transcripts WHERE quarantine_prefix IS NOT NULL
    UNION ALL SELECT quarantine_prefix || '/parsed.json' FROM transcripts WHERE quarantine_prefix IS NOT NULL
    UNION ALL SELECT object_key FROM transcripts WHERE object_key IS NOT NULL
    UNION ALL SELECT file_key FROM consent_forms
    UNION ALL SELECT file_key FROM interview_guides
    UNION ALL SELECT signed_file_key FROM consent_records WHERE signed_file_key IS NOT NULL
    UNION ALL SELECT receipt_key FROM consent_records WHERE receipt_key IS NOT NULL`)
  return new Set(rows.map((r) => r.key))
}

async function orphans(): Promise<string[]> {
  const referenced = await referencedKeys()
  return (await drill.s3.keys()).filter((key) => !referenced.has(key))
}

function storageProblem(res: { status: number; headers: Record<string, string>; body: any; text: string }) {
  expect(res.status, res.text).toBe(503)
  expect(res.headers['content-type']).toMatch(/^application\/problem\+json/)
  expect(res.body.detail).toMatch(/file storage is not available.*try again/i)
  expect(res.text).not.toMatch(STACK_TRACE)
}

async function count(table: string, where: string, value: string): Promise<number> {
  const { rows } = await drill.db.query<{ n: number }>(`SELECT count(*)::int AS n FROM ${table} WHERE ${where} = $1`, [value])
  return rows[0]!.n
}

describe('the object store stopped before and during uploads (security.md test 98)', () => {
  it('refuses each upload with a clear 503, keeps no row, object or temp file, and succeeds on retry once it is back', async () => {
    const pid = drill.app.child!.pid
    const interview = await interviewReadyForTranscript('Sam Store')
    const pdf = await makePdf('Guide')
    const form = { ...FORM_V1, label: 'v2.0' }
    const objectsBefore = (await drill.s3.keys()).length

    await drill.s3.stop()
    const stoppedAt = Date.now()
    const transcript = await uploadTranscript(coordinator, team.study.id, interview.id, TRANSCRIPT)
    const consentForm = await uploadForm(lead, team.study.id, form)
    const guide = await uploadGuide('g-down', pdf)
    const health = await lead.get('/api/health')
    console.info('[fault drill] object store down:', JSON.stringify({
      transcript: [transcript.status, transcript.body.detail],
      consentForm: [consentForm.status, consentForm.body.detail],
      guide: [guide.status, guide.body.detail],
      health: [health.status, health.body],
      msForThree: Date.now() - stoppedAt,
    }))
    for (const res of [transcript, consentForm, guide]) storageProblem(res)
    expect(health.status).toBe(503)
    expect(health.body).toMatchObject({ db: 'ok', storage: 'unreachable' })
    // no row that could be mistaken for a stored file
    expect(await count('transcripts', 'interview_id', interview.id)).toBe(0)
    expect(await count('consent_forms', 'label', form.label)).toBe(0)
    expect(await count('interview_guides', 'label', 'g-down')).toBe(0)
    expect(drill.app.tempFiles()).toEqual([])
    expect(drill.app.unexpectedExits).toEqual([])
    expect(drill.app.child?.pid).toBe(pid)

    await drill.s3.start()
    const startedAt = Date.now()
    await until(async () => (await lead.get('/api/health')).status === 200, 10_000, 'health recovers')
    const recoveredMs = Date.now() - startedAt
    expect(await orphans()).toEqual([])
    expect((await drill.s3.keys()).length).toBe(objectsBefore)
    const retried = [
      await uploadTranscript(coordinator, team.study.id, interview.id, TRANSCRIPT),
      await uploadForm(lead, team.study.id, form),
      await uploadGuide('g-down', pdf),
    ]
    console.info('[fault drill] object store back:', JSON.stringify({ healthOkAfterMs: recoveredMs, retried: retried.map((r) => r.status) }))
    for (const res of retried) expect(res.status, res.text).toBe(201)
    expect(await count('transcripts', 'interview_id', interview.id)).toBe(1)
    expect(await orphans()).toEqual([])
    expect(drill.app.tempFiles()).toEqual([])
  })

  it('an upload already under way when the store stops gets the same 503 and leaves nothing behind', async () => {
    const interview = await interviewReadyForTranscript('Una Underway')
    // The drill holds a lock on interviews, so the upload (its file already received) waits at its first
    // look-up; the store stops while it waits, and the upload goes on to store the file.
    const holder = await drill.db.connect()
    let res
    try {
      await holder.query('BEGIN')
      await holder.query('LOCK TABLE interviews IN ACCESS EXCLUSIVE MODE')
      const pending = uploadTranscript(coordinator, team.study.id, interview.id, TRANSCRIPT).then((r) => r)
      await until(async () => {
        const { rows } = await drill.db.query(
          `SELECT 1 FROM pg_stat_activity WHERE datname = 'drill' AND wait_event_type = 'Lock' AND application_name <> $1 AND query ILIKE '%interviews%'`,
          [DRILL_APPLICATION_NAME],
        )
        return rows.length > 0
      }, 10_000, 'the upload waits')
      await drill.s3.stop()
      await holder.query('ROLLBACK')
      res = await pending
    } finally {
      await holder.query('ROLLBACK').catch(() => {})
      holder.release()
      await drill.s3.start()
    }
    storageProblem(res)
    expect(await count('transcripts', 'interview_id', interview.id)).toBe(0)
    expect(await orphans()).toEqual([])
    expect(drill.app.tempFiles()).toEqual([])
    const retry = await uploadTranscript(coordinator, team.study.id, interview.id, TRANSCRIPT)
    expect(retry.status, retry.text).toBe(201)
  })
})

describe('the database fails after the file is stored (security.md test 99)', () => {
  /**
   * Holds `table` against writes, sends the upload, waits until its write is blocked, notes the objects
   * stored by then (the test checks there are some), then cuts the app's database connections.
   */
  async function cutAfterPut(table: string, send: () => PromiseLike<any>) {
    const keysBefore = new Set(await drill.s3.keys())
    const holder = await drill.db.connect()
    try {
      await holder.query('BEGIN')
      // SHARE mode: reads go on, writes wait (an upload may look rows up before storing its file)
      await holder.query(`LOCK TABLE ${table} IN SHARE MODE`)
      const pending = Promise.resolve(send())
      await until(async () => {
        const { rows } = await drill.db.query(
          `SELECT 1 FROM pg_stat_activity WHERE datname = 'drill' AND wait_event_type = 'Lock' AND application_name <> $1`,
          [DRILL_APPLICATION_NAME],
        )
        return rows.length > 0
      }, 10_000, `the upload waits to write ${table}`)
      const stored = (await drill.s3.keys()).filter((k) => !keysBefore.has(k))
      await drill.postgres.terminateAppConnections()
      const res = await pending
      return { res, stored }
    } finally {
      await holder.query('ROLLBACK').catch(() => {})
      holder.release()
    }
  }

  it('removes the stored files again, so the bucket holds no orphans, and the retry succeeds', async () => {
    const interview = await interviewReadyForTranscript('Dana Database')
    const transcript = await cutAfterPut('transcripts', () => uploadTranscript(coordinator, team.study.id, interview.id, TRANSCRIPT))
    const guide = await cutAfterPut('interview_guides', async () => uploadGuide('g-cut', await makePdf('Guide')))
    const form = await cutAfterPut('consent_forms', async () => uploadForm(lead, team.study.id, { ...FORM_V1, label: 'v3.0' }))
    console.info('[fault drill] database cut after the file was stored:', JSON.stringify(
      Object.fromEntries(Object.entries({ transcript, guide, form }).map(([k, v]) => [k, { status: v.res.status, storedBeforeCut: v.stored.length, detail: v.res.body.detail }])),
    ))
    // each file really was in the bucket before the database failed
    expect(transcript.stored).toHaveLength(2) // the upload and its parsed form, in quarantine
    expect(guide.stored).toHaveLength(1)
    expect(form.stored).toHaveLength(1)
    for (const { res } of [transcript, guide, form]) {
      expect(res.status, res.text).toBe(503)
      expect(res.body.detail).toMatch(/database is not reachable.*try again/i)
    }
    const remaining = new Set(await drill.s3.keys())
    for (const key of [...transcript.stored, ...guide.stored, ...form.stored]) expect(remaining.has(key), key).toBe(false)
    expect(await orphans()).toEqual([])
    expect(await count('transcripts', 'interview_id', interview.id)).toBe(0)
    expect(drill.app.unexpectedExits).toEqual([])
    const retry = await uploadTranscript(coordinator, team.study.id, interview.id, TRANSCRIPT)
    expect(retry.status, retry.text).toBe(201)
    expect(await orphans()).toEqual([])
  })
})
