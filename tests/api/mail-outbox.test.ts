import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest'
import { freePort } from '../../scripts/lib/postgres.mjs'
import { startFakeSmtp } from '../../server/fakes/fake-smtp.js'
import { OutboxMessage } from '../../server/modules/mail/outbox-message.entity.js'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { mailsTo } from '../support/mailbox.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * E-mail goes through the outbox (nodemailer has no queue of its own: nodemailer #405): a mail server
 * that is down delays mail and loses none, and two workers never send the same message twice.
 */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
})
afterAll(() => ctx?.close())

async function until(check: () => Promise<boolean> | boolean, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (await check()) return
    await new Promise((r) => setTimeout(r, 250))
  }
  throw new Error('condition not met in time')
}

describe('e-mail outbox', () => {
  it('writes the message in the same transaction as the action; nothing is written when the action fails', async () => {
    const lead = new Client(ctx.app)
    await lead.signIn(team.users.lead.email, TEST_PASSWORD)
    const before = await ctx.dataSource.getRepository(OutboxMessage).count()
    // inviting someone who is already a member fails: no invitation, no e-mail
    const res = await lead.post(`/api/studies/${team.study.id}/invitations`, { email: team.users.coder.email, role: 'coder' })
    expect(res.status).toBe(409)
    expect(await ctx.dataSource.getRepository(OutboxMessage).count()).toBe(before)
  })

  it('keeps mail while the SMTP server is down and sends each message exactly once when it returns', async () => {
    const lead = new Client(ctx.app)
    await lead.signIn(team.users.lead.email, TEST_PASSWORD)
    const port = await freePort() // nothing listens here yet: the mail server is "down"
    const recipients = [uniqueEmail('waiting'), uniqueEmail('waiting')]
    for (const email of recipients) {
      expect((await lead.post(`/api/studies/${team.study.id}/invitations`, { email, role: 'coder' })).status).toBe(201)
    }
    // two workers, as two app instances would run
    await ctx.startMailWorker(`smtp://127.0.0.1:${port}?ignoreTLS=true`)
    await ctx.startMailWorker(`smtp://127.0.0.1:${port}?ignoreTLS=true`)
    const outbox = ctx.dataSource.getRepository(OutboxMessage)
    await until(async () => (await outbox.findBy({ to: recipients[0] }))[0]!.attempts >= 1, 15_000)
    const waiting = await outbox.findBy({ to: recipients[0] })
    expect(waiting[0]!.status).toBe('pending')
    expect(waiting[0]!.lastError).toBeTruthy()

    const mailboxDir = `${inject('workDir')}/mail-late-${port}`
    const server = await startFakeSmtp(mailboxDir, port)
    try {
      // pg-boss retries with backoff; make the waiting jobs due now rather than waiting out the backoff
      await ctx.dataSource.query(`UPDATE pgboss.job SET start_after = now() WHERE name = 'mail-send' AND state = 'retry'`)
      await until(async () => (await outbox.findBy({ status: 'sent' })).filter((m) => recipients.includes(m.to)).length === 2, 30_000)
      await new Promise((r) => setTimeout(r, 2000))
      const { readMailbox } = await import('../../server/fakes/mailbox-store.js')
      const received = readMailbox(mailboxDir)
      for (const email of recipients) expect(received.filter((m) => m.to.includes(email))).toHaveLength(1)
    } finally {
      await server.close()
    }
    expect(mailsTo(recipients[0]!)).toHaveLength(0) // it did not go to the usual test mailbox either
  })
})
