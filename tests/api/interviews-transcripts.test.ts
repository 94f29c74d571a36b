import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AuditService } from '../../server/modules/audit/audit.service.js'
import { InterviewService } from '../../server/modules/interviews/interview.service.js'
import { MailService } from '../../server/modules/mail/mail.service.js'
import { createLogger } from '../../server/lib/logger.js'
import { purgeWithdrawnData } from '../../server/modules/transcripts/withdrawn-data-purge.js'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { buildDocx } from '../fixtures/transcripts/docx.js'
import { makePdf } from '../support/consent.js'
import { consentedParticipant, doneInterview, uploadTranscript } from '../support/interviews.js'
import { waitForMail } from '../support/mailbox.js'
import { openRecruitment } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
let coordinator: Client
let coder: Client
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  coordinator = new Client(ctx.app)
  coder = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
  await coordinator.signIn(team.users.coordinator.email, TEST_PASSWORD)
  await coder.signIn(team.users.coder.email, TEST_PASSWORD)
  await openRecruitment(lead, team.study.id)
  await ctx.startMailWorker()
})
afterAll(() => ctx?.close())

const base = () => `/api/studies/${team.study.id}`

const TRANSCRIPT = [
  '[0:00:05] Interviewer: Thank you for talking with me today.',
  '[0:00:09] Margery Quillfeather: Of course. When Dad came home from Eastbrook General on 14 March 2024 nobody told us anything.',
  '[0:01:12] Interviewer: What happened next?',
  '[0:01:15] Margery Quillfeather: I rang the ward on (604) 555-0142 and emailed margery.q@example.org but Dr Okonkwo-Reyes never replied.',
  '[0:02:40] Interviewer: That sounds hard.',
].join('\n')

describe('interview guides', () => {
  it('the lead adds a guide version (checked by content); coordinators list and download it', async () => {
    const add = (client: Client, buffer: Buffer) =>
      client.agent
        .post(`${base()}/interview-guides`)
        .set('X-CSRF-Token', client.csrf)
        .field('metadata', JSON.stringify({ label: 'Guide v1', approvalDate: '2026-02-02', text: 'Tell me about the day your relative came home.' }))
        .attach('file', buffer, 'guide.pdf')
    expect((await add(lead, Buffer.from('not a pdf at all'))).status).toBe(415)
    expect((await add(coordinator, await makePdf('guide'))).status).toBe(403)
    const created = await add(lead, await makePdf('guide'))
    expect(created.status).toBe(201)
    expect(created.body.file.sha256).toMatch(/^[0-9a-f]{64}$/)
    const list = (await coordinator.get(`${base()}/interview-guides`)).body.guides
    expect(list.map((g: { label: string }) => g.label)).toEqual(['Guide v1'])
    const file = await coordinator.get(`${base()}/interview-guides/${created.body.id}/file`)
    expect(file.status).toBe(200)
    expect(file.headers['content-disposition']).toMatch(/^attachment;/)
    expect((await coder.get(`${base()}/interview-guides`)).status).toBe(403)
  })
})

describe('interviews', () => {
  it('books an interview in the participant’s zone, shows both clocks across a DST change, and e-mails a calendar file', async () => {
    const email = uniqueEmail('interviewee')
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Ivy Interview', email)
    const res = await coordinator.post(`${base()}/interviews`, {
      participantId: pid,
      localTime: '2027-03-20T09:00',
      timeZoneOf: 'participant',
      participantTimeZone: 'America/Vancouver',
      interviewerId: team.users.coordinator.id,
      interviewerTimeZone: 'Europe/London',
      mode: 'phone',
      plannedMinutes: 45,
    })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.scheduledAt).toBe('2027-03-20T16:00:00.000Z')
    expect(res.body.participantLocal).toMatch(/09:00/)
    expect(res.body.interviewerLocal).toMatch(/16:00/)
    const mail = await waitForMail(email, /Your interview is booked/)
    expect(mail.attachments[0]).toMatchObject({ filename: 'interview.ics' })
    // rescheduling into the interviewer's zone sends an update
    const moved = await coordinator.patch(`${base()}/interviews/${res.body.id}`, { localTime: '2027-04-03T17:00', timeZoneOf: 'interviewer' })
    expect(moved.body.scheduledAt).toBe('2027-04-03T16:00:00.000Z') // London on BST (UTC+1) by then
    await waitForMail(email, /Your interview has changed/)
    // a reminder job waits for 24 hours before the new time; a stale one (older sequence) sends nothing
    const jobs = await ctx.dataSource.query(`SELECT data, start_after FROM pgboss.job WHERE name = 'interview-reminder' AND data->>'interviewId' = $1 ORDER BY created_on`, [res.body.id])
    expect(jobs).toHaveLength(2)
    expect(new Date(jobs[1].start_after).toISOString()).toBe('2027-04-02T16:00:00.000Z')
    const interviews = new InterviewService(ctx.dataSource, ctx.boss, new AuditService(ctx.dataSource), new MailService(ctx.dataSource, ctx.boss, ctx.config.MAIL_FROM, createLogger('silent')), null as never)
    await interviews.sendReminder(res.body.id, jobs[0].data.sequence)
    await interviews.sendReminder(res.body.id, jobs[1].data.sequence)
    await waitForMail(email, /Reminder: your interview is tomorrow/)
    const reminders = (await import('../support/mailbox.js')).mailsTo(email).filter((m) => /Reminder/.test(m.subject))
    expect(reminders).toHaveLength(1)
    const gap = await coordinator.patch(`${base()}/interviews/${res.body.id}`, { localTime: '2027-03-14T02:30', timeZoneOf: 'participant' })
    expect(gap.status).toBe(400)
    const cancelled = await coordinator.post(`${base()}/interviews/${res.body.id}/outcome`, { status: 'cancelled' })
    expect(cancelled.body.status).toBe('cancelled')
    await waitForMail(email, /Your interview is cancelled/)
  })

  it('marks the interview notes-only when audio recording was declined, and refuses a transcript for it', async () => {
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Nora Notes', uniqueEmail('notes'), { audio_recording: false, direct_quotes: true, future_contact: false })
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    expect(interview.notesOnly).toBe(true)
    const res = await uploadTranscript(coordinator, team.study.id, interview.id, Buffer.from(TRANSCRIPT))
    expect(res.status).toBe(409)
    expect(res.body.detail).toMatch(/field notes only/)
  })
})

describe('transcripts', () => {
  it('goes from upload to reviewed flags to approval; coders then read only the de-identified text', async () => {
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Margery Quillfeather', uniqueEmail('margery'))
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    const uploaded = await uploadTranscript(coordinator, team.study.id, interview.id, await buildDocx(TRANSCRIPT.split('\n')), 'interview.docx')
    expect(uploaded.status, JSON.stringify(uploaded.body)).toBe(201)
    expect(uploaded.body).toMatchObject({ status: 'in_review', format: 'docx', version: 1 })
    const tid = uploaded.body.id

    // while in review: coders see nothing; the quarantine holds the upload
    expect((await coder.get(`${base()}/transcripts`)).body.transcripts).toEqual([])
    expect((await coder.get(`${base()}/transcripts/${tid}/deidentification`)).status).toBe(403)
    const [row] = await ctx.dataSource.query('SELECT quarantine_prefix FROM transcripts WHERE id = $1', [tid])
    expect(await ctx.storage.head(`${row.quarantine_prefix}/upload`)).not.toBeNull()

    const review = (await coordinator.get(`${base()}/transcripts/${tid}/deidentification`)).body
    const flagged = review.flags.map((f: { text: string; category: string }) => `${f.category}:${f.text}`)
    expect(flagged).toEqual(expect.arrayContaining(['date:14 March 2024', 'phone:(604) 555-0142', 'email:margery.q@example.org']))
    expect(flagged.some((f: string) => f.startsWith('name:') && f.includes('Okonkwo'))).toBe(true)
    expect(review.turns[1].speaker).toBe('Margery Quillfeather') // the reviewer sees the label as uploaded

    expect((await coordinator.post(`${base()}/transcripts/${tid}/approve`)).status).toBe(409) // flags still pending
    const decisions = review.flags.map((f: { id: string }) => ({ id: f.id, decision: 'accepted' }))
    const decided = await coordinator.put(`${base()}/transcripts/${tid}/deidentification`, {
      decisions,
      acceptEverywhere: [{ term: 'Margery', category: 'name' }],
      manual: [{ start: review.text.indexOf('Eastbrook General'), end: review.text.indexOf('Eastbrook General') + 'Eastbrook General'.length, category: 'location' }],
    })
    expect(decided.status, JSON.stringify(decided.body)).toBe(200)
    const approved = await coordinator.post(`${base()}/transcripts/${tid}/approve`)
    expect(approved.status, JSON.stringify(approved.body)).toBe(200)
    expect(approved.body.status).toBe('approved')
    expect(await ctx.storage.head(`${row.quarantine_prefix}/upload`)).toBeNull()
    expect(await ctx.storage.head(`${row.quarantine_prefix}/parsed.json`)).toBeNull()

    const list = (await coder.get(`${base()}/transcripts`)).body.transcripts
    expect(list.map((t: { id: string }) => t.id)).toContain(tid)
    const reading = (await coder.get(`${base()}/transcripts/${tid}`)).body
    for (const secret of ['Quillfeather', 'Margery', '555-0142', 'margery.q@example.org', '14 March 2024', 'Eastbrook General', 'Okonkwo']) {
      expect(reading.text).not.toContain(secret)
    }
    expect(reading.text).toMatch(/\[NAME-\d+\]/)
    expect(reading.text).toMatch(/\[DATE-1\]/)
    for (const turn of reading.turns) expect(reading.text.slice(turn.start, turn.end).length).toBeGreaterThan(0)
    expect(reading.turns[0]).toMatchObject({ speaker: 'Interviewer', startMs: 5000 })
    expect(reading.turns[1].speaker).toBe(list.find((t: { id: string }) => t.id === tid).pseudonym) // the name label became the pseudonym
    expect(reading.text.slice(reading.turns[1].start, reading.turns[1].end)).toMatch(/^Of course\. When Dad came home from \[PLACE-\d+\]/)

    const log = (await lead.get(`${base()}/anonymisation-log`)).body.entries
    expect(log.map((e: { original: string }) => e.original)).toEqual(expect.arrayContaining(['(604) 555-0142', '14 March 2024']))
    expect((await coder.get(`${base()}/anonymisation-log`)).status).toBe(403)
  })

  it('flags the team’s own list of terms in every new upload; coders cannot read the list', async () => {
    const saved = await coordinator.put(`${base()}/deidentification-terms`, { terms: [{ term: 'Harrowgate Mill', category: 'location' }] })
    expect(saved.status).toBe(200)
    expect((await coder.get(`${base()}/deidentification-terms`)).status).toBe(403)
    expect((await coordinator.put(`${base()}/deidentification-terms`, { terms: [{ term: 'x', category: 'location' }] })).status).toBe(400)
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Terry Terms', uniqueEmail('terms'))
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    const up = await uploadTranscript(coordinator, team.study.id, interview.id, Buffer.from('Interviewer: Where was rehab?\nP: out at harrowgate mill, every morning.'))
    const review = (await coordinator.get(`${base()}/transcripts/${up.body.id}/deidentification`)).body
    expect(review.flags).toEqual(expect.arrayContaining([expect.objectContaining({ text: 'harrowgate mill', category: 'location' })]))
  })

  it('keeps placeholders consistent across the study: the same person gets the same placeholder', async () => {
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Otto Second', uniqueEmail('otto'))
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    const text = 'Interviewer: Who helped?\nOtto Second: Dr Okonkwo-Reyes did, eventually, on 2 April 2024.'
    const up = await uploadTranscript(coordinator, team.study.id, interview.id, Buffer.from(text))
    const review = (await coordinator.get(`${base()}/transcripts/${up.body.id}/deidentification`)).body
    const firstLog = (await lead.get(`${base()}/anonymisation-log`)).body.entries
    const earlier = firstLog.find((e: { original: string }) => e.original.includes('Okonkwo'))
    await coordinator.put(`${base()}/transcripts/${up.body.id}/deidentification`, { decisions: review.flags.map((f: { id: string }) => ({ id: f.id, decision: 'accepted' })) })
    expect((await coordinator.post(`${base()}/transcripts/${up.body.id}/approve`)).status).toBe(200)
    const reading = (await coder.get(`${base()}/transcripts/${up.body.id}`)).body
    if (earlier) expect(reading.text).toContain(earlier.placeholder)
  })

  it('rolls back an approval when the object store is down, and succeeds on retry', async () => {
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Stella Storage', uniqueEmail('stella'))
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    const up = await uploadTranscript(coordinator, team.study.id, interview.id, Buffer.from('Interviewer: Hello.\nP: We met on 3 May 2024 at the clinic.'))
    const review = (await coordinator.get(`${base()}/transcripts/${up.body.id}/deidentification`)).body
    await coordinator.put(`${base()}/transcripts/${up.body.id}/deidentification`, { decisions: review.flags.map((f: { id: string }) => ({ id: f.id, decision: 'accepted' })) })
    // a second app instance on the same database whose object store cannot be reached
    const down = await createTestContext({ DATABASE_URL: ctx.databaseUrl, S3_ENDPOINT: 'http://127.0.0.1:9' })
    try {
      const c = new Client(down.app)
      await c.signIn(team.users.coordinator.email, TEST_PASSWORD)
      const res = await c.post(`${base()}/transcripts/${up.body.id}/approve`)
      expect(res.status).toBe(503)
      expect(res.body.detail).toMatch(/try again/i)
    } finally {
      await down.close()
    }
    const [row] = await ctx.dataSource.query('SELECT status, object_key FROM transcripts WHERE id = $1', [up.body.id])
    expect(row).toEqual({ status: 'in_review', object_key: null })
    const [{ n }] = await ctx.dataSource.query('SELECT count(*)::int AS n FROM transcript_turns WHERE transcript_id = $1', [up.body.id])
    expect(n).toBe(0)
    expect((await coordinator.post(`${base()}/transcripts/${up.body.id}/approve`)).status).toBe(200)
  })

  it('refuses wrong types, empty files and broken captions with a reason, saving nothing', async () => {
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Bea Broken', uniqueEmail('broken'))
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    const cases: [Buffer, RegExp][] = [
      [Buffer.from('%PDF-1.7\n1 0 obj\n'), /PDF/],
      [Buffer.alloc(0), /empty/i],
      [Buffer.from([0xff, 0xfe, 0x00, 0x41]), /./],
      [Buffer.from('WEBVTT\n\n00:00:05.000 --> 00:00:02.000\n<v Ana>Backwards cue\n'), /./],
      [Buffer.from('Interviewer: Hello\nP07:\n'), /Line 2/],
    ]
    for (const [buffer, reason] of cases) {
      const res = await uploadTranscript(coordinator, team.study.id, interview.id, buffer)
      expect(res.status, JSON.stringify(res.body)).toBe(400)
      expect(res.body.detail).toMatch(reason)
    }
    const huge = await uploadTranscript(coordinator, team.study.id, interview.id, Buffer.alloc(20 * 1024 * 1024 + 1, 'a'))
    expect(huge.status).toBe(413)
    const [{ n }] = await ctx.dataSource.query('SELECT count(*)::int AS n FROM transcripts WHERE interview_id = $1', [interview.id])
    expect(n).toBe(0)
  })

  it('a participant who withdraws their data disappears from coders’ transcripts at once', async () => {
    const pid = await consentedParticipant(coordinator, lead, team.study.id, 'Wes Withdraws', uniqueEmail('wes'))
    const interview = await doneInterview(coordinator, team.study.id, pid, team.users.coordinator.id)
    const up = await uploadTranscript(coordinator, team.study.id, interview.id, Buffer.from('Interviewer: Hello there.\nP: It was a long spring.'))
    const review = (await coordinator.get(`${base()}/transcripts/${up.body.id}/deidentification`)).body
    await coordinator.put(`${base()}/transcripts/${up.body.id}/deidentification`, { decisions: review.flags.map((f: { id: string }) => ({ id: f.id, decision: 'rejected' })) })
    await coordinator.post(`${base()}/transcripts/${up.body.id}/approve`)
    expect((await coder.get(`${base()}/transcripts/${up.body.id}`)).status).toBe(200)
    await coordinator.post(`${base()}/participants/${pid}/withdrawal`, { scope: 'withdraw_data', effectiveDate: new Date().toISOString().slice(0, 10) })
    expect((await coder.get(`${base()}/transcripts/${up.body.id}`)).status).toBe(404)
    expect((await coder.get(`${base()}/transcripts`)).body.transcripts.some((t: { id: string }) => t.id === up.body.id)).toBe(false)
    // the file itself goes after the study's grace period (this study set 14 days), not before
    const [{ object_key: key }] = await ctx.dataSource.query('SELECT object_key FROM transcripts WHERE id = $1', [up.body.id])
    const audit = new AuditService(ctx.dataSource)
    expect(await purgeWithdrawnData(ctx.dataSource, ctx.storage, audit, new Date(Date.now() + 13 * 86_400_000))).toBe(0)
    expect(await ctx.storage.head(key)).not.toBeNull()
    expect(await purgeWithdrawnData(ctx.dataSource, ctx.storage, audit, new Date(Date.now() + 15 * 86_400_000))).toBe(1)
    expect(await ctx.storage.head(key)).toBeNull()
    const [purged] = await ctx.dataSource.query('SELECT purged_at, object_key FROM transcripts WHERE id = $1', [up.body.id])
    expect(purged.purged_at).not.toBeNull()
    expect(purged.object_key).toBeNull()
  })
})
