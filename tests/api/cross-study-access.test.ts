import { randomBytes, randomUUID } from 'node:crypto'
import { ListObjectsV2Command } from '@aws-sdk/client-s3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { decide, type Access, type StudyRole } from '../../shared/permissions.js'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { makePdf } from '../support/consent.js'
import { addMember, makeStudy, makeUser, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { approvedTranscript, uploadTranscript } from '../support/interviews.js'
import { ELIGIBLE_ANSWERS, openRecruitment } from '../support/recruitment.js'
import { listRoutes, type RegisteredRoute } from '../support/routes.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * Cross-study access by id (security.md tests 41 and 42; ASVS 5.0 8.2.2, 8.4.1; WSTG-ATHZ-04).
 *
 * Study A is the demo study (every kind of record), with the few kinds the demo lacks added through the
 * API (an interview guide, an invitation, a transcript still in review, an open review round). Study B
 * belongs to X, who leads it, and to XP, its patient partner. X (or XP where only a partner may call the
 * route) calls every route whose path carries an id, with :studyId = B and A's real ids, by every method
 * registered, with an empty body and with a valid one. The answer must be 403/404, identical to the answer
 * for random ids (nothing tells A's ids apart), carry none of A's content, and change nothing: every table
 * and A's objects in the bucket are compared before and after. Then the nested ids: A's ids in the bodies
 * and queries of B's own routes.
 */
let ctx: TestContext
let A: string
let B: string
let x: Client
let xp: Client
let leadA: Client
let coordinatorA: Client

/** A's records, one real id per route parameter (the ones used together belong together). */
const aIds: Record<string, string> = {}
/** B's own records, for bodies that need a valid id of the caller's study. */
const bIds: Record<string, string> = {}
/** the optimistic-lock versions of A's records, so a body would pass the version check */
const aVersions: Record<string, number> = {}
/** a real stretch of A's approved transcript */
let aSelection = { start: 0, end: 1, text: '' }
/** strings that only A's records hold: none may reach X */
let aStrings: string[] = []

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete'

const B_TRANSCRIPT = [
  '[0:00:04] Interviewer: Thanks for meeting with me on the ferry day.',
  '[0:00:09] Orla Fenwick-Tarrant: The lighthouse keeper cottage was quiet when Grandad came back, and the kettle never stopped.',
  '[0:00:40] Interviewer: What did the nurses explain?',
  '[0:00:44] Orla Fenwick-Tarrant: Very little about the tablets; we learnt the pill organiser ourselves over the first fortnight.',
].join('\n')

async function signedIn(email: string, password: string): Promise<Client> {
  const client = new Client(ctx.app)
  const res = await client.signIn(email, password)
  if (res.status !== 200) throw new Error(`sign-in ${email}: ${res.status}`)
  return client
}

async function one<T = Record<string, unknown>>(sql: string, params: unknown[]): Promise<T> {
  const [row] = (await ctx.dataSource.query(sql, params)) as T[]
  if (!row) throw new Error(`no fixture row for: ${sql}`)
  return row
}

beforeAll(async () => {
  ctx = await createTestContext()
  A = (await seedDemo(ctx.dataSource, 'test', undefined, ctx.storage)).studyId
  leadA = await signedIn('lead@heardwell.test', DEMO_PASSWORD)
  coordinatorA = await signedIn('coordinator@heardwell.test', DEMO_PASSWORD)

  // the kinds of record the demo does not hold, added by A's own team through the API
  const guide = await leadA.agent
    .post(`/api/studies/${A}/interview-guides`)
    .set('X-CSRF-Token', leadA.csrf)
    .field('metadata', JSON.stringify({ label: 'Guide A-Heronsgate', approvalDate: '2026-02-02', text: 'Heronsgate guide: ask about the first night at home.' }))
    .attach('file', await makePdf('Heronsgate guide'), 'heronsgate-guide.pdf')
  expect(guide.status).toBe(201)
  aIds.guideId = guide.body.id
  const invitation = await leadA.post(`/api/studies/${A}/invitations`, { email: 'quennell.invitee@example.org', role: 'coder' })
  expect(invitation.status).toBe(201)
  aIds.invitationId = invitation.body.id
  const themes = (await leadA.get(`/api/studies/${A}/themes`)).body.themes as { id: string; name: string; inOpenRound: boolean }[]
  const round = await leadA.post(`/api/studies/${A}/review-rounds`, { title: 'Heronsgate open round', themeIds: [themes[0]!.id], closesOn: '2099-01-31' })
  expect(round.status).toBe(201)
  aIds.openRoundId = round.body.id
  aIds.openRoundThemeId = themes[0]!.id
  // a second version of an approved transcript, left in review (the review routes act on it)
  const interview = await one<{ id: string }>(
    `SELECT t.interview_id AS id FROM transcripts t JOIN participants p ON p.id = t.participant_id
     WHERE t.study_id = $1 AND t.status = 'approved' AND p.pseudonym <> 'P08' ORDER BY p.pseudonym LIMIT 1`,
    [A],
  )
  const upload = await uploadTranscript(coordinatorA, A, interview.id, Buffer.from('Interviewer: Hello again.\nCaregiver: The Heronsgate district nurse came on Tuesdays.\n'))
  expect(upload.status).toBe(201)
  aIds.reviewTranscriptId = upload.body.id

  // every route parameter that names a record of A
  const q = (sql: string) => one<{ id: string }>(sql, [A]).then((r) => r.id)
  aIds.participantId = await q(`SELECT p.id FROM participants p JOIN consent_records c ON c.participant_id = p.id WHERE p.study_id = $1 ORDER BY p.pseudonym LIMIT 1`)
  aIds.consentId = await one<{ id: string }>(`SELECT id FROM consent_records WHERE study_id = $1 AND participant_id = $2 LIMIT 1`, [A, aIds.participantId]).then((r) => r.id)
  aIds.formId = await q(`SELECT id FROM consent_forms WHERE study_id = $1 ORDER BY created_at LIMIT 1`)
  aIds.approvedFormId = await q(`SELECT id FROM consent_forms WHERE study_id = $1 AND status = 'approved' LIMIT 1`)
  aIds.interviewId = interview.id
  aIds.transcriptId = await q(`SELECT id FROM transcripts WHERE study_id = $1 AND status = 'approved' ORDER BY created_at LIMIT 1`)
  aIds.codeId = await q(`SELECT id FROM codes WHERE study_id = $1 ORDER BY label LIMIT 1`)
  aIds.otherCodeId = await q(`SELECT id FROM codes WHERE study_id = $1 ORDER BY label DESC LIMIT 1`)
  aIds.excerptId = await q(`SELECT id FROM excerpts WHERE study_id = $1 ORDER BY created_at LIMIT 1`)
  aIds.memoId = await q(`SELECT id FROM memos WHERE study_id = $1 ORDER BY created_at LIMIT 1`)
  aIds.themeId = themes[0]!.id
  aIds.roundId = await q(`SELECT id FROM review_rounds WHERE study_id = $1 AND status = 'closed' LIMIT 1`)
  aIds.answerId = await one<{ id: string }>(`SELECT id FROM partner_answers WHERE round_id = $1 LIMIT 1`, [aIds.roundId]).then((r) => r.id)
  aIds.snapshotId = await q(`SELECT id FROM codebook_snapshots WHERE study_id = $1 LIMIT 1`)
  aIds.memberId = await q(`SELECT id FROM memberships WHERE study_id = $1 AND role = 'coder' LIMIT 1`)
  aIds.leadUserId = await q(`SELECT user_id AS id FROM memberships WHERE study_id = $1 AND role = 'lead'`)
  aIds.coderUserId = await q(`SELECT user_id AS id FROM memberships WHERE study_id = $1 AND role = 'coder' LIMIT 1`)
  aIds.consentLinkId = await q(`SELECT id FROM consent_links WHERE study_id = $1 LIMIT 1`)
  for (const [table, key] of [['codes', 'codeId'], ['themes', 'themeId'], ['excerpts', 'excerptId'], ['memos', 'memoId']] as const) {
    aVersions[key] = (await one<{ version: number }>(`SELECT version FROM ${table} WHERE id = $1`, [aIds[key]])).version
  }
  const aReading = (await leadA.get(`/api/studies/${A}/transcripts/${aIds.transcriptId}`)).body as { text: string; turns: { start: number; end: number }[] }
  const turn = aReading.turns[1]!
  aSelection = { start: turn.start, end: turn.start + 20, text: aReading.text.slice(turn.start, turn.start + 20) }

  // study B: led by X, with XP as its patient partner, built through the API
  const study = await makeStudy(ctx.dataSource, { title: 'Kestrel Bay caregivers' })
  B = study.id
  const userX = await makeUser(ctx.dataSource, { email: uniqueEmail('x-lead'), name: 'Xavi Lindqvist-Ormond' })
  const userXP = await makeUser(ctx.dataSource, { email: uniqueEmail('x-partner'), name: 'Pell Ashdown' })
  await addMember(ctx.dataSource, study, userX, 'lead')
  await addMember(ctx.dataSource, study, userXP, 'partner')
  x = await signedIn(userX.email, TEST_PASSWORD)
  xp = await signedIn(userXP.email, TEST_PASSWORD)
  bIds.userId = userX.id
  await openRecruitment(x, B)
  const bt = await approvedTranscript(x, x, B, 'Orla Fenwick-Tarrant', uniqueEmail('orla'), B_TRANSCRIPT)
  bIds.transcriptId = bt.transcriptId
  bIds.participantId = bt.participantId
  bIds.formId = ((await x.get(`/api/studies/${B}/consent-forms`)).body.forms as { id: string }[])[0]!.id
  const code = await x.post(`/api/studies/${B}/codes`, { label: 'Kestrel medicines' })
  expect(code.status).toBe(201)
  bIds.codeId = code.body.id
  const reading = (await x.get(`/api/studies/${B}/transcripts/${bIds.transcriptId}`)).body as { text: string }
  const phrase = 'pill organiser'
  const start = reading.text.indexOf(phrase)
  const excerpt = await x.post(`/api/studies/${B}/transcripts/${bIds.transcriptId}/excerpts`, { start, end: start + phrase.length, text: phrase, codeIds: [bIds.codeId] })
  expect(excerpt.status).toBe(201)
  bIds.excerptId = excerpt.body.id
  bIds.excerptStart = String(start)
  const theme = await x.post(`/api/studies/${B}/themes`, { name: 'Learning the tablets alone', codeIds: [bIds.codeId] })
  expect(theme.status).toBe(201)
  bIds.themeId = theme.body.id
  const scheduled = await x.post(`/api/studies/${B}/interviews`, {
    participantId: bIds.participantId,
    localTime: '2027-04-01T10:00',
    timeZoneOf: 'participant',
    participantTimeZone: 'America/Vancouver',
    interviewerId: bIds.userId,
    interviewerTimeZone: 'Europe/London',
    mode: 'video',
    plannedMinutes: 60,
  })
  expect(scheduled.status).toBe(201)
  bIds.scheduledInterviewId = scheduled.body.id

  aStrings = await distinctiveStringsOfA()
  expect(aStrings.length).toBeGreaterThan(40)
})
afterAll(() => ctx?.close())

/** Content only A holds: names and e-mails of its participants and team, codes, memos, themes, transcripts, forms. */
async function distinctiveStringsOfA(): Promise<string[]> {
  const rows = (await ctx.dataSource.query(
    `SELECT c.name AS s FROM participant_contacts c JOIN participants p ON p.id = c.participant_id WHERE p.study_id = $1
     UNION SELECT c.email FROM participant_contacts c JOIN participants p ON p.id = c.participant_id WHERE p.study_id = $1
     UNION SELECT u.name FROM users u JOIN memberships m ON m.user_id = u.id WHERE m.study_id = $1
     UNION SELECT u.email FROM users u JOIN memberships m ON m.user_id = u.id WHERE m.study_id = $1
     UNION SELECT label FROM codes WHERE study_id = $1
     UNION SELECT left(body, 60) FROM memos WHERE study_id = $1
     UNION SELECT left(text, 60) FROM excerpts WHERE study_id = $1
     UNION SELECT name FROM themes WHERE study_id = $1
     UNION SELECT title FROM review_rounds WHERE study_id = $1
     UNION SELECT left(comment, 60) FROM partner_answers a JOIN review_rounds r ON r.id = a.round_id WHERE r.study_id = $1
     UNION SELECT left(text, 60) FROM consent_forms WHERE study_id = $1
     UNION SELECT label FROM interview_guides WHERE study_id = $1
     UNION SELECT email FROM invitations WHERE study_id = $1
     UNION SELECT title FROM studies WHERE id = $1`,
    [A],
  )) as { s: string | null }[]
  const strings = rows.map((r) => (r.s ?? '').trim()).filter((s) => s.length >= 8)
  // transcript text, as A's own lead reads it
  for (const path of [`transcripts/${aIds.transcriptId}`, `transcripts/${aIds.reviewTranscriptId}/deidentification`]) {
    const text = (await leadA.get(`/api/studies/${A}/${path}`)).body.text as string
    for (let i = 0; i + 50 < text.length; i += 400) strings.push(text.slice(i, i + 50).trim())
  }
  return [...new Set(strings.filter((s) => s.length >= 8))]
}

/** Every table's content as one md5 each, and A's objects in the bucket: "no change" is equality of both. */
async function stateFingerprint(): Promise<{ tables: Record<string, string>; objects: string[] }> {
  const names = (await ctx.dataSource.query(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT IN ('session', 'rate_limits', 'migrations') ORDER BY tablename`)) as { tablename: string }[]
  const tables: Record<string, string> = {}
  for (const { tablename } of names) {
    const [row] = await ctx.dataSource.query(`SELECT count(*)::text || ':' || coalesce(md5(string_agg(t::text, '|' ORDER BY t::text)), '') AS h FROM "${tablename}" t`)
    tables[tablename] = row.h
  }
  const objects: string[] = []
  for (const prefix of [`studies/${A}/`, `quarantine/studies/${A}/`]) {
    let token: string | undefined
    do {
      const page = await ctx.storage.client.send(new ListObjectsV2Command({ Bucket: ctx.storage.bucket, Prefix: prefix, ContinuationToken: token }))
      for (const o of page.Contents ?? []) objects.push(`${o.Key} ${o.Size} ${o.ETag}`)
      token = page.NextContinuationToken
    } while (token)
  }
  return { tables, objects: objects.sort() }
}

function changedTables(before: Record<string, string>, after: Record<string, string>): string[] {
  return Object.keys({ ...before, ...after }).filter((t) => before[t] !== after[t])
}

function leaks(body: string): string[] {
  return aStrings.filter((s) => body.includes(s))
}

/* ---------------------------------------------------------------- test 41: ids in the path */

/**
 * What each route parameter is. A record id gets A's real id (one per variant: the closed review round with
 * its answer, then the open round with one of its themes, and so on); anything else says why it is not a
 * record of a study. A parameter missing here fails the test, so a new route cannot go unchecked.
 */
type ParamKind = { record: (variant: number) => string } | { notARecord: string }
const PARAMS: Record<string, ParamKind> = {
  answerId: { record: () => aIds.answerId! },
  codeId: { record: (v) => (v === 0 ? aIds.codeId! : aIds.otherCodeId!) },
  consentId: { record: () => aIds.consentId! },
  excerptId: { record: () => aIds.excerptId! },
  formId: { record: (v) => (v === 0 ? aIds.formId! : aIds.approvedFormId!) },
  guideId: { record: () => aIds.guideId! },
  interviewId: { record: () => aIds.interviewId! },
  invitationId: { record: () => aIds.invitationId! },
  memberId: { record: () => aIds.memberId! },
  memoId: { record: () => aIds.memoId! },
  participantId: { record: () => aIds.participantId! },
  roundId: { record: (v) => (v === 0 ? aIds.roundId! : aIds.openRoundId!) },
  snapshotId: { record: () => aIds.snapshotId! },
  themeId: { record: (v) => (v === 0 ? aIds.themeId! : aIds.openRoundThemeId!) },
  transcriptId: { record: (v) => (v === 0 ? aIds.transcriptId! : aIds.reviewTranscriptId!) },
  userId: { record: (v) => (v === 0 ? aIds.leadUserId! : aIds.coderUserId!) },
  // a bearer secret, not a record id: A's record ids put in its place must open nothing
  token: { record: (v) => (v === 0 ? aIds.invitationId! : aIds.consentLinkId!) },
  checklist: { notARecord: 'the name of a reporting checklist (coreq, srqr), the same in every study' },
  number: { notARecord: 'an item number of a reporting checklist, the same in every study' },
  code: { notARecord: 'a study’s public recruitment code: its enquiry page is public by design' },
}
const VARIANTS = [0, 1]

/** A body that passes validation, so that only the foreign id can stop the request; B's own ids where one is needed. */
function validBody(method: string, path: string): { json?: object; query?: string; multipart?: () => Promise<{ metadata?: string; file: Buffer; name: string }> } | undefined {
  const clauses = { audio_recording: true, direct_quotes: true, future_contact: true }
  const key = `${method} ${path.replace(/^\/api\/studies\/:studyId/, '')}`
  const bodies: Record<string, ReturnType<typeof validBody>> = {
    'PATCH /api/users/:userId': { json: { disabled: true } },
    'POST /api/invitations/:token/accept': { json: { name: 'Xavi Lindqvist-Ormond', password: TEST_PASSWORD } },
    'POST /api/public/consent/:token': { json: { clauses, signerName: 'Xavi Lindqvist-Ormond', agree: true } },
    'POST /api/public/withdrawal/:token': { json: { scope: 'withdraw_data', reason: 'X tries' } },
    'PUT /transcripts/:transcriptId/deidentification': { json: { decisions: [] } },
    'POST /transcripts/:transcriptId/approve': { json: {} },
    'POST /transcripts/:transcriptId/reject': { json: {} },
    'POST /interviews/:interviewId/transcripts': { multipart: async () => ({ file: Buffer.from('Interviewer: Hello.\nCaregiver: X uploads into A.\n'), name: 'x.txt' }) },
    'PATCH /interviews/:interviewId': { json: { plannedMinutes: 45 } },
    'POST /interviews/:interviewId/outcome': { json: { status: 'cancelled' } },
    'PATCH /themes/:themeId': { json: { version: aVersions.themeId, name: 'Renamed by X' } },
    'DELETE /themes/:themeId': { query: `version=${aVersions.themeId}` },
    'POST /review-rounds/:roundId/close': { json: {} },
    'PUT /review-rounds/:roundId/answers/:answerId/response': { json: { response: 'Answered by X' } },
    'PUT /partner/rounds/:roundId/themes/:themeId': { json: { verdict: 'rings_true', comment: 'Sent by X’s partner', submit: true } },
    'PATCH /members/:memberId': { json: { role: 'partner' } },
    'POST /participants/:participantId/screenings': { json: { answers: ELIGIBLE_ANSWERS } },
    'POST /participants/:participantId/override': { json: { outcome: 'not_eligible', reason: 'Overridden by X' } },
    'POST /participants/:participantId/consents': { json: { formId: bIds.formId, clauses, signerName: 'Signed via X' } },
    'POST /participants/:participantId/consents/written': {
      multipart: async () => ({ metadata: JSON.stringify({ formId: bIds.formId, clauses, signerName: 'Signed via X' }), file: await makePdf('signed'), name: 'signed.pdf' }),
    },
    'POST /participants/:participantId/consent-links': { json: { formId: bIds.formId } },
    'POST /participants/:participantId/withdrawal': { json: { scope: 'stop_keep_data', effectiveDate: '2026-06-01' } },
    'PATCH /consent-forms/:formId': { json: { label: 'v9 by X' } },
    'POST /consent-forms/:formId/approve': { json: {} },
    'POST /transcripts/:transcriptId/excerpts': { json: { ...aSelection, codeIds: [bIds.codeId] } },
    'PATCH /excerpts/:excerptId': { json: { version: aVersions.excerptId, codeIds: [bIds.codeId] } },
    'DELETE /excerpts/:excerptId': { query: `version=${aVersions.excerptId}` },
    'PATCH /codes/:codeId': { json: { version: aVersions.codeId, label: 'Renamed by X' } },
    'PUT /codes/:codeId/position': { json: { version: aVersions.codeId, parentId: null, position: 0 } },
    'POST /codes/:codeId/merge': { json: { version: aVersions.codeId, intoId: bIds.codeId } },
    'POST /codes/:codeId/split': { json: { version: aVersions.codeId, newCode: { label: 'Split by X' }, excerptIds: [bIds.excerptId] } },
    'PATCH /memos/:memoId': { json: { version: aVersions.memoId, body: 'Edited by X' } },
  }
  return bodies[key] ?? (method === 'GET' || method === 'DELETE' ? {} : undefined)
}

/** The member of B allowed to call the route (X, or XP for the partner's own routes); X for site routes. */
function callerFor(access: Access): Client {
  const allowed = (role: StudyRole) => decide({ signedIn: true, siteAdmin: false, role }, access) === 'allow'
  return !allowed('lead') && allowed('partner') ? xp : x
}

async function call(client: Client, method: Method, path: string, body: ReturnType<typeof validBody> | 'empty') {
  if (body === 'empty') return client.agent[method](path).set('X-CSRF-Token', client.csrf).set('Content-Type', 'application/json').send('{}')
  const url = body?.query ? `${path}?${body.query}` : path
  if (body?.multipart) {
    const m = await body.multipart()
    const req = client.agent.post(url).set('X-CSRF-Token', client.csrf)
    if (m.metadata) void req.field('metadata', m.metadata)
    return req.attach('file', m.file, m.name)
  }
  if (method === 'get') return client.get(url)
  return client.agent[method](url).set('X-CSRF-Token', client.csrf).send(body?.json ?? {})
}

describe('cross-study access by id in the path (security.md test 41; ASVS 5.0 8.2.2, 8.4.1)', () => {
  it('knows every route parameter (a new kind of id fails here until it has a fixture)', () => {
    const params = new Set(listRoutes(ctx.app).flatMap((r) => [...r.path.matchAll(/:([A-Za-z]+)/g)].map((m) => m[1]!)))
    const unknown = [...params].filter((p) => p !== 'studyId' && !(p in PARAMS))
    expect(unknown, 'route parameters without a cross-study fixture').toEqual([])
    expect(params.size).toBeGreaterThan(15)
  })

  it('X, leading study B, reaches nothing of study A with A’s ids: 403/404 like a random id, no data, no change', async () => {
    const routes = listRoutes(ctx.app).filter((r): r is RegisteredRoute & { access: Access } => r.path.startsWith('/api/') && Boolean(r.access))
    const withIds = routes.filter((r) => [...r.path.matchAll(/:([A-Za-z]+)/g)].some((m) => m[1] !== 'studyId' && 'record' in (PARAMS[m[1]!] ?? { record: null })))
    const missingBody = withIds.filter((r) => !validBody(r.method, r.path)).map((r) => `${r.method} ${r.path}`)
    expect(missingBody, 'routes with an id but no valid body fixture').toEqual([])

    const before = await stateFingerprint()
    const problems: string[] = []
    let requests = 0
    const statuses = new Map<number, number>()
    const seen = new Set<string>()
    for (const route of withIds) {
      const method = route.method.toLowerCase() as Method
      const client = callerFor(route.access)
      for (const variant of VARIANTS) {
        const fill = (pick: (name: string) => string) =>
          route.path.replace(/:([A-Za-z]+)/g, (_m, name: string) => {
            if (name === 'studyId') return B
            const kind = PARAMS[name]!
            return 'record' in kind ? pick(name) : name === 'checklist' ? 'coreq' : '1'
          })
        const foreign = fill((name) => (PARAMS[name] as { record: (v: number) => string }).record(variant))
        if (seen.has(`${method} ${foreign}`)) continue
        seen.add(`${method} ${foreign}`)
        const random = fill((name) => (name === 'token' ? randomBytes(24).toString('base64url') : randomUUID()))
        const bodies: (ReturnType<typeof validBody> | 'empty')[] = method === 'get' ? [validBody(route.method, route.path)] : ['empty', validBody(route.method, route.path)]
        for (const body of bodies) {
          const res = await call(client, method, foreign, body)
          const control = await call(client, method, random, body)
          requests += 2
          const label = `${route.method} ${foreign.replace(B, ':B')} (${body === 'empty' ? '{}' : 'valid body'})`
          const allowed = body === 'empty' ? [400, 403, 404, 410, 415] : [403, 404, 410]
          if (!allowed.includes(res.status)) problems.push(`${label}: ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`)
          else if (res.status !== control.status || res.body?.type !== control.body?.type) problems.push(`${label}: ${res.status} ${res.body?.type} but a random id gets ${control.status} ${control.body?.type}`)
          // the body fixture must pass validation, or the check would stop before the id is looked up
          if (body !== 'empty' && control.status === 400) problems.push(`${label}: the valid body fixture is refused: ${JSON.stringify(control.body).slice(0, 200)}`)
          statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1)
          if (!String(res.headers['content-type']).startsWith('application/problem+json')) problems.push(`${label}: not problem+json (${res.headers['content-type']})`)
          const found = leaks(res.text ?? '')
          if (found.length) problems.push(`${label}: A's content in the answer: ${found.slice(0, 3).join(' | ')}`)
        }
      }
    }
    const after = await stateFingerprint()
    expect(problems).toEqual([])
    expect(changedTables(before.tables, after.tables), 'tables changed by X’s requests').toEqual([])
    expect(after.objects).toEqual(before.objects)
    expect(withIds.length).toBeGreaterThan(40)
    expect(requests).toBeGreaterThan(200)
    console.info(`cross-study: ${withIds.length} routes × methods with ids, ${requests} requests, answers to A's ids: ${JSON.stringify(Object.fromEntries(statuses))}`)
  })
})

/* ------------------------------------------------------- test 42: A's ids inside B's bodies and queries */

describe('A’s ids nested in bodies and queries of study B’s own routes (security.md tests 41, 42; ASVS 5.0 8.2.2)', () => {
  it('refuses every write in B that names a record of A, and writes nothing', async () => {
    const clauses = { audio_recording: true, direct_quotes: true, future_contact: true }
    const bVersion = async (table: string, id: string) => (await one<{ version: number }>(`SELECT version FROM ${table} WHERE id = $1`, [id])).version
    const bInterview = bIds.scheduledInterviewId!
    const phrase = 'lighthouse keeper'
    const bText = ((await x.get(`/api/studies/${B}/transcripts/${bIds.transcriptId}`)).body as { text: string }).text
    const at = bText.indexOf(phrase)
    const s = `/api/studies/${B}`
    const cases: [Method, string, object][] = [
      // a coded excerpt in B's transcript with A's code (the catalogue's own example)
      ['post', `${s}/transcripts/${bIds.transcriptId}/excerpts`, { start: at, end: at + phrase.length, text: phrase, codeIds: [aIds.codeId] }],
      ['post', `${s}/transcripts/${bIds.transcriptId}/excerpts`, { start: at, end: at + phrase.length, text: phrase, codeIds: [bIds.codeId, aIds.codeId] }],
      ['patch', `${s}/excerpts/${bIds.excerptId}`, { version: await bVersion('excerpts', bIds.excerptId!), codeIds: [aIds.codeId] }],
      // the codebook: parents, examples, merges and splits across studies
      ['post', `${s}/codes`, { label: 'Child of A', parentId: aIds.codeId }],
      ['post', `${s}/codes`, { label: 'Example from A', exampleExcerptId: aIds.excerptId }],
      ['patch', `${s}/codes/${bIds.codeId}`, { version: await bVersion('codes', bIds.codeId!), exampleExcerptId: aIds.excerptId }],
      ['put', `${s}/codes/${bIds.codeId}/position`, { version: await bVersion('codes', bIds.codeId!), parentId: aIds.codeId, position: 0 }],
      ['post', `${s}/codes/${bIds.codeId}/merge`, { version: await bVersion('codes', bIds.codeId!), intoId: aIds.codeId }],
      ['post', `${s}/codes/${bIds.codeId}/split`, { version: await bVersion('codes', bIds.codeId!), newCode: { label: 'Split off' }, excerptIds: [aIds.excerptId] }],
      // themes and review rounds
      ['post', `${s}/themes`, { name: 'Built on A’s code', codeIds: [aIds.codeId] }],
      ['post', `${s}/themes`, { name: 'Built on A’s excerpt', excerpts: [{ excerptId: aIds.excerptId, shareWithPartners: true }] }],
      ['post', `${s}/themes`, { name: 'Under A’s theme', parentId: aIds.themeId }],
      ['patch', `${s}/themes/${bIds.themeId}`, { version: await bVersion('themes', bIds.themeId!), codeIds: [bIds.codeId, aIds.codeId] }],
      ['patch', `${s}/themes/${bIds.themeId}`, { version: await bVersion('themes', bIds.themeId!), excerpts: [{ excerptId: aIds.excerptId, shareWithPartners: true }] }],
      ['put', `${s}/themes/order`, { order: [{ id: bIds.themeId, parentId: null, position: 0 }, { id: aIds.themeId, parentId: null, position: 1 }] }],
      ['put', `${s}/themes/order`, { order: [{ id: bIds.themeId, parentId: aIds.themeId, position: 0 }] }],
      ['post', `${s}/review-rounds`, { title: 'Round on A’s theme', themeIds: [aIds.themeId], closesOn: '2099-01-31' }],
      ['post', `${s}/review-rounds`, { title: 'Round on both', themeIds: [bIds.themeId, aIds.openRoundThemeId], closesOn: '2099-01-31' }],
      // memos attached to A's records
      ['post', `${s}/memos`, { targetType: 'excerpt', targetId: aIds.excerptId, body: 'On A’s excerpt' }],
      ['post', `${s}/memos`, { targetType: 'code', targetId: aIds.codeId, body: 'On A’s code' }],
      ['post', `${s}/memos`, { targetType: 'transcript', targetId: aIds.transcriptId, body: 'On A’s transcript' }],
      // interviews with A's participant, guide or interviewer
      ['post', `${s}/interviews`, { participantId: aIds.participantId, localTime: '2027-04-01T10:00', timeZoneOf: 'participant', participantTimeZone: 'America/Vancouver', interviewerId: bIds.userId, interviewerTimeZone: 'Europe/London', mode: 'video', plannedMinutes: 60 }],
      ['post', `${s}/interviews`, { participantId: bIds.participantId, localTime: '2027-04-01T10:00', timeZoneOf: 'participant', participantTimeZone: 'America/Vancouver', interviewerId: aIds.leadUserId, interviewerTimeZone: 'Europe/London', mode: 'video', plannedMinutes: 60 }],
      ['post', `${s}/interviews`, { participantId: bIds.participantId, localTime: '2027-04-01T10:00', timeZoneOf: 'participant', participantTimeZone: 'America/Vancouver', interviewerId: bIds.userId, interviewerTimeZone: 'Europe/London', mode: 'video', plannedMinutes: 60, guideId: aIds.guideId }],
      ['patch', `${s}/interviews/${bInterview}`, { guideId: aIds.guideId }],
      ['patch', `${s}/interviews/${bInterview}`, { interviewerId: aIds.coderUserId }],
      // consent on A's form version, or correcting A's consent record
      ['post', `${s}/participants/${bIds.participantId}/consents`, { formId: aIds.approvedFormId, clauses, signerName: 'Orla Fenwick-Tarrant' }],
      ['post', `${s}/participants/${bIds.participantId}/consents`, { formId: bIds.formId, clauses, signerName: 'Orla Fenwick-Tarrant', corrects: aIds.consentId }],
      ['post', `${s}/participants/${bIds.participantId}/consent-links`, { formId: aIds.approvedFormId }],
    ]
    const before = await stateFingerprint()
    const bBefore = await ctx.dataSource.query(`SELECT (SELECT count(*) FROM excerpts WHERE study_id = $1) AS e, (SELECT count(*) FROM codes WHERE study_id = $1) AS c, (SELECT count(*) FROM themes WHERE study_id = $1) AS t, (SELECT count(*) FROM memos WHERE study_id = $1) AS m`, [B])
    const problems: string[] = []
    for (const [method, path, body] of cases) {
      const res = await x.agent[method](path).set('X-CSRF-Token', x.csrf).send(body)
      const label = `${method.toUpperCase()} ${path.replace(B, ':B')} ${JSON.stringify(body).slice(0, 90)}`
      if (res.status < 400 || res.status >= 500) problems.push(`${label}: ${res.status} ${JSON.stringify(res.body).slice(0, 160)}`)
      const found = leaks(res.text ?? '')
      if (found.length) problems.push(`${label}: A's content in the answer: ${found.slice(0, 3).join(' | ')}`)
    }
    const after = await stateFingerprint()
    expect(problems).toEqual([])
    expect(changedTables(before.tables, after.tables), 'tables changed by the refused writes').toEqual([])
    expect(after.objects).toEqual(before.objects)
    expect(await ctx.dataSource.query(`SELECT (SELECT count(*) FROM excerpts WHERE study_id = $1) AS e, (SELECT count(*) FROM codes WHERE study_id = $1) AS c, (SELECT count(*) FROM themes WHERE study_id = $1) AS t, (SELECT count(*) FROM memos WHERE study_id = $1) AS m`, [B])).toEqual(bBefore)
    // the same kind of write with B's own ids goes through, so the refusals above are about A's ids
    const control = await x.post(`${s}/transcripts/${bIds.transcriptId}/excerpts`, { start: at, end: at + phrase.length, text: phrase, codeIds: [bIds.codeId] })
    expect(control.status).toBe(201)
    expect((await x.post(`${s}/memos`, { targetType: 'code', targetId: bIds.codeId, body: 'On B’s own code' })).status).toBe(201)
  })

  it('filters by A’s ids in B’s queries return none of A’s data', async () => {
    const s = `/api/studies/${B}`
    const word = 'blood thinner' // a phrase of A's transcripts (demo data), absent from B's
    expect(aStrings.some((t) => t.toLowerCase().includes(word)) || (await leadA.get(`/api/studies/${A}/search?q=${encodeURIComponent(word)}`)).text.includes('thinner')).toBe(true)
    const queries = [
      `${s}/excerpts?codeId=${aIds.codeId}`,
      `${s}/memos?targetId=${aIds.excerptId}`,
      `${s}/memos?targetType=code&targetId=${aIds.codeId}`,
      `${s}/search?q=${encodeURIComponent(word)}`,
      `${s}/search?q=${encodeURIComponent(word)}&transcriptId=${aIds.transcriptId}`,
      `${s}/search?q=${encodeURIComponent(word)}&codeId=${aIds.codeId}&coderId=${aIds.coderUserId}`,
      `${s}/interviews?participantId=${aIds.participantId}`,
      `${s}/transcripts/${bIds.transcriptId}/excerpts?coderId=${aIds.coderUserId}`,
      `${s}/agreement?coderIds=${aIds.coderUserId}&coderIds=${bIds.userId}`,
      `${s}/saturation?coderId=${aIds.coderUserId}`,
      `${s}/matrices/code-participant?coderId=${aIds.coderUserId}`,
      `${s}/matrices/co-occurrence?coderId=${aIds.coderUserId}`,
      `${s}/matrices/code-participant.csv?coderId=${aIds.coderUserId}`,
    ]
    const problems: string[] = []
    for (const path of queries) {
      const res = await x.get(path)
      if (res.status >= 500 || res.status === 401 || res.status === 403) problems.push(`${path}: ${res.status}`)
      const found = leaks(res.text ?? '')
      if (found.length) problems.push(`${path.replace(B, ':B')}: A's content in the answer: ${found.slice(0, 3).join(' | ')}`)
      const body = res.body as { results?: unknown[]; excerpts?: unknown[]; memos?: unknown[]; interviews?: unknown[] }
      for (const list of ['results', 'memos', 'interviews'] as const) {
        if (Array.isArray(body?.[list]) && body[list]!.length) problems.push(`${path.replace(B, ':B')}: ${list} not empty: ${JSON.stringify(body[list]).slice(0, 120)}`)
      }
    }
    expect(problems).toEqual([])
  })
})
