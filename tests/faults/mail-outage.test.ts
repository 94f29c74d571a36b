/**
 * Fault drill: the SMTP server stops, e-mails are caused, the app itself restarts, then SMTP returns.
 * The real server (with its outbox worker) runs as a child process with a fake SMTP server of its own
 * that the drill stops and starts on the same port (tests/faults/support/drill.ts).
 *
 * security.md test 101 (outbox written with the business change, retried with backoff, delivered exactly
 * once after recovery, surviving a restart; ASVS 5.0 16.5.2, 13.1.3).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { approvedForm } from '../support/consent.js'
import { makeTeam, uniqueEmail } from '../support/factories.js'
import { ELIGIBLE_ANSWERS, openRecruitment } from '../support/recruitment.js'
import { Client, type TestContext } from '../support/test-app.js'
import { signedInClient, startDrill, type Drill } from './support/drill.js'
import { sleep, until } from './support/http.js'

interface OutboxRow {
  id: string
  to_address: string
  message_id: string
  status: string
  attempts: number
  last_error: string | null
}

let drill: Drill
let team: Awaited<ReturnType<typeof makeTeam>>


beforeAll(async () => {
  drill = await startDrill('smtp')
  team = await makeTeam(drill.dataSource)
})

afterAll(async () => {
  await drill?.close()
})

const outbox = async (): Promise<OutboxRow[]> => (await drill.db.query<OutboxRow>('SELECT id, to_address, message_id, status, attempts, last_error FROM mail_outbox')).rows

describe('the SMTP server stopped while e-mails are caused, and the app restarted (security.md test 101)', () => {
  it('keeps every message in the outbox and sends each exactly once after SMTP returns', async () => {
    const lead = await signedInClient(drill, team.users.lead.email)
    const coordinator = await signedInClient(drill, team.users.coordinator.email)
    const base = `/api/studies/${team.study.id}`
    await openRecruitment(lead, team.study.id)
    await approvedForm(lead, team.study.id)
    const participants: string[] = []
    for (const name of ['Ola Outbox', 'Pia Pending']) {
      const created = await coordinator.post(`${base}/participants`, {
        contact: { name, email: uniqueEmail('participant'), phone: '', country: 'Canada', timeZone: 'America/Vancouver' },
        source: 'phone',
        answers: ELIGIBLE_ANSWERS,
      })
      expect(created.status, created.text).toBe(201)
      participants.push(created.body.id)
    }
    // whatever the set-up sent has gone out before the drill starts
    await until(async () => (await outbox()).every((m) => m.status === 'sent'), 20_000, 'set-up mail sent')
    const before = new Set((await outbox()).map((m) => m.id))
    const mailboxBefore = drill.smtp.received().length

    await drill.smtp.stop()
    const stoppedAt = Date.now()
    const answers: number[] = []
    for (const role of ['coder', 'coder', 'partner']) {
      answers.push((await lead.post(`${base}/invitations`, { email: uniqueEmail('invitee'), role })).status)
    }
    for (const id of participants) answers.push((await coordinator.post(`${base}/participants/${id}/consent-links`, {})).status)
    const visitor = new Client(drill.app.url as unknown as TestContext['app'])
    await visitor.refreshCsrf()
    answers.push((await visitor.post('/api/auth/password-reset', { email: team.users.coder.email })).status)
    // the actions do not wait for the mail server
    expect(answers).toEqual([201, 201, 201, 201, 201, 202])
    const health = await lead.get('/api/health')
    expect(health.status).toBe(200) // mail only delays; the app is up
    expect(health.body.mail).toBe('unreachable')

    const waiting = () => outbox().then((rows) => rows.filter((m) => !before.has(m.id)))
    expect((await waiting()).length).toBe(answers.length)
    // the worker tries each message, fails, and keeps it
    await until(async () => (await waiting()).every((m) => m.attempts >= 1), 20_000, 'each message tried once')
    for (const m of await waiting()) {
      expect(m.status).toBe('pending')
      expect(m.last_error).toMatch(/ECONNREFUSED|connect/i)
    }

    // the app restarts while the messages wait
    const oldPid = drill.app.child!.pid
    expect(await drill.app.stop()).toBe(0)
    await drill.app.start()
    expect(drill.app.child!.pid).not.toBe(oldPid)
    const pending = await waiting()
    expect(pending.every((m) => m.status === 'pending')).toBe(true)

    await drill.smtp.start()
    const startedAt = Date.now()
    const deliveredAfterMs = await until(async () => (await waiting()).every((m) => m.status === 'sent'), 60_000, 'every message sent', 500)
    await sleep(2000) // time for a duplicate to show, if one were coming
    const sent = await waiting()
    const received = drill.smtp.received()
    const copies = sent.map((m) => received.filter((r) => r.messageId === m.message_id).length)
    console.info('[fault drill] SMTP outage:', JSON.stringify({
      messages: sent.length,
      smtpDownForMs: startedAt - stoppedAt,
      deliveredAfterSmtpBackMs: deliveredAfterMs,
      attempts: sent.map((m) => m.attempts),
      copiesReceived: copies,
    }))
    // each message arrived once, to its recipient, and nothing else was sent
    expect(copies).toEqual(sent.map(() => 1))
    for (const m of sent) expect(received.find((r) => r.messageId === m.message_id)!.to).toEqual([m.to_address])
    expect(received.length - mailboxBefore).toBe(sent.length)
    for (const m of sent) expect(m.attempts).toBeGreaterThanOrEqual(2)
    const { rows: jobs } = await drill.db.query<{ state: string }>(`SELECT state FROM pgboss.job WHERE name = 'mail-send' AND data->>'outboxId' = ANY($1)`, [sent.map((m) => m.id)])
    expect(jobs.map((j) => j.state)).toEqual(sent.map(() => 'completed'))
    expect(drill.app.unexpectedExits).toEqual([])
  })
})
