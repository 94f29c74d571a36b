import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { User } from '../../server/modules/users/user.entity.js'
import { makeTeam, makeUser, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { linkIn, waitForMail } from '../support/mailbox.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  await ctx.startMailWorker()
})
afterAll(() => ctx?.close())

async function signedIn(email: string, password = TEST_PASSWORD) {
  const client = new Client(ctx.app)
  expect((await client.signIn(email, password)).status).toBe(200)
  return client
}

/** Password rules after NIST SP 800-63B-4 §3.1.1.2 and OWASP ASVS 5.0 V6.2 (see ../shared/reference/security.md, test catalogue 1–8). */
describe('changing a password', () => {
  it('refuses 14 code points and accepts 15 (catalogue test 1)', async () => {
    const user = await makeUser(ctx.dataSource)
    const client = await signedIn(user.email)
    const short = await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'fourteen chars' })
    expect(short.status).toBe(400)
    expect(short.body.errors[0]).toEqual({ path: 'newPassword', message: expect.stringMatching(/at least 15 characters \(this one has 14\)/) })
    const ok = await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'fifteen chars!!' })
    expect(ok.status).toBe(204)
  })

  it('counts emoji as one character each: 15 emoji are 15 code points (catalogue test 3)', async () => {
    const user = await makeUser(ctx.dataSource)
    const client = await signedIn(user.email)
    const emoji = '🌿🌊🌙🍵📚🐢🌻🎻🧭🪴🍞🚲🌈🧶🐝'
    expect([...emoji]).toHaveLength(15)
    expect(emoji.length).toBe(30)
    expect((await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: emoji })).status).toBe(204)
    await signedIn(user.email, emoji)
  })

  it('normalises before hashing: set with é as NFC, sign in typing NFD (catalogue test 4)', async () => {
    const user = await makeUser(ctx.dataSource)
    const client = await signedIn(user.email)
    const nfc = 'caf\u00e9 on the long road home'
    expect((await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: nfc })).status).toBe(204)
    await signedIn(user.email, nfc.normalize('NFD'))
  })

  it('never truncates: a 100-character password without its last character is refused (catalogue test 5)', async () => {
    const user = await makeUser(ctx.dataSource)
    const client = await signedIn(user.email)
    const long = 'a long sentence about walking the dog by the river in the early morning light, every day, rain or sun!'
    expect([...long].length).toBeGreaterThanOrEqual(100)
    expect((await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: long })).status).toBe(204)
    expect((await new Client(ctx.app).signIn(user.email, long.slice(0, -1))).status).toBe(401)
    expect((await new Client(ctx.app).signIn(user.email, long.slice(0, 72))).status).toBe(401)
    await signedIn(user.email, long)
  })

  it('refuses a common password, the product name and the user\'s own e-mail, but accepts a passphrase that merely contains a common word (catalogue test 7)', async () => {
    const user = await makeUser(ctx.dataSource, { email: 'margaret.oakhill@example.org' })
    const client = await signedIn(user.email)
    const attempts = {
      common: 'qwerty123456789', // in the zxcvbn-ts common list (breach corpora)
      repeated: 'abcabcabcabcabcabc',
      product: 'Heardwell2026!!!',
      email: 'margaret.oakhill1',
    }
    for (const [why, newPassword] of Object.entries(attempts)) {
      const res = await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword })
      expect(res.status, why).toBe(400)
      expect(res.body.detail, why).toMatch(/commonly used|built from|repeated or sequential/)
    }
    const passphrase = 'my password is the smell of rain on warm stones'
    expect((await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: passphrase })).status).toBe(204)
  })

  it('accepts a 256-character password of spaces, CJK and emoji and refuses one over 1,024 (catalogue test 2)', async () => {
    const user = await makeUser(ctx.dataSource)
    const client = await signedIn(user.email)
    const mixed = '静かな川 🌙 quiet river '.repeat(20).slice(0, 256)
    expect((await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: mixed })).status).toBe(204)
    const huge = 'x'.repeat(1025)
    const res = await client.post('/api/auth/password', { currentPassword: mixed, newPassword: huge })
    expect(res.status).toBe(400)
  })

  it('needs the right current password, stores an argon2id hash and tells the person by e-mail (catalogue tests 8, 13)', async () => {
    const user = await makeUser(ctx.dataSource, { email: uniqueEmail('changer') })
    const client = await signedIn(user.email)
    const other = await signedIn(user.email)
    const wrong = await client.post('/api/auth/password', { currentPassword: 'not my current one', newPassword: 'a brand new long passphrase' })
    expect(wrong.status).toBe(403)
    expect((await client.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'a brand new long passphrase' })).status).toBe(204)
    const stored = await ctx.dataSource.getRepository(User).findOneByOrFail({ id: user.id })
    expect(stored.passwordHash).toMatch(/^\$argon2id\$v=19\$m=65536,t=3,p=4\$/)
    expect((await other.get('/api/auth/me')).status).toBe(401)
    expect((await client.get('/api/auth/me')).status).toBe(200)
    await waitForMail(user.email, /password was changed/)
  })
})

describe('password reset by e-mail', () => {
  it('answers the same for known and unknown e-mails, and the e-mailed link works once', async () => {
    const user = await makeUser(ctx.dataSource, { email: uniqueEmail('forgot') })
    const anon = new Client(ctx.app)
    await anon.refreshCsrf()
    const known = await anon.post('/api/auth/password-reset', { email: user.email })
    const unknown = await anon.post('/api/auth/password-reset', { email: uniqueEmail('ghost') })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(known.body).toEqual(unknown.body)

    const mail = await waitForMail(user.email, /Reset your Heardwell password/)
    const token = linkIn(mail, '/reset-password')
    const [stored] = await ctx.dataSource.query(`SELECT token_hash FROM password_reset_tokens WHERE user_id = $1`, [user.id])
    expect(stored.token_hash).not.toContain(token)
    expect(Buffer.from(token, 'base64url').length).toBeGreaterThanOrEqual(16)

    const tooShort = await anon.post('/api/auth/password-reset/confirm', { token, password: 'short one' })
    expect(tooShort.status).toBe(400)
    const done = await anon.post('/api/auth/password-reset/confirm', { token, password: 'the lighthouse keeper sleeps late' })
    expect(done.status).toBe(204)
    const reused = await anon.post('/api/auth/password-reset/confirm', { token, password: 'another lighthouse keeper story' })
    expect(reused.status).toBe(410)
    expect(reused.body.detail).toMatch(/Ask for a new one/)
    await signedIn(user.email, 'the lighthouse keeper sleeps late')
  })

  it('refuses an expired link with a way to ask again', async () => {
    const user = await makeUser(ctx.dataSource, { email: uniqueEmail('late') })
    const anon = new Client(ctx.app)
    await anon.refreshCsrf()
    await anon.post('/api/auth/password-reset', { email: user.email })
    const token = linkIn(await waitForMail(user.email, /Reset/), '/reset-password')
    await ctx.dataSource.query(`UPDATE password_reset_tokens SET expires_at = now() - interval '1 minute' WHERE user_id = $1`, [user.id])
    const res = await anon.post('/api/auth/password-reset/confirm', { token, password: 'too late for this passphrase' })
    expect(res.status).toBe(410)
    expect(res.body.detail).toMatch(/expired/)
  })
})

describe('team invitations', () => {
  it('a new person accepts an e-mailed invitation, chooses a password and lands on the study with the invited role', async () => {
    const lead = await signedIn(team.users.lead.email)
    const email = uniqueEmail('newcoder')
    expect((await lead.post(`/api/studies/${team.study.id}/invitations`, { email, role: 'coder' })).status).toBe(201)
    const token = linkIn(await waitForMail(email, /invited to join/), '/invitations')
    const anon = new Client(ctx.app)
    await anon.refreshCsrf()
    const preview = await anon.get(`/api/invitations/${token}`)
    expect(preview.body).toMatchObject({ email, role: 'coder', accountExists: false, studyTitle: team.study.title })
    const weak = await anon.post(`/api/invitations/${token}/accept`, { name: 'Nadia Coder', password: '1qaz2wsx3edc4rfv' })
    expect(weak.status).toBe(400)
    const accepted = await anon.post(`/api/invitations/${token}/accept`, { name: 'Nadia Coder', password: 'reading transcripts by lamplight' })
    expect(accepted.status).toBe(200)
    expect(accepted.body.memberships).toEqual([expect.objectContaining({ studyId: team.study.id, role: 'coder' })])
    expect((await anon.agent.get('/api/auth/me')).status).toBe(200)
    const again = await new Client(ctx.app).get(`/api/invitations/${token}`)
    expect(again.status).toBe(410)
    expect(again.body.detail).toMatch(/already used/)
  })

  it('an existing account confirms with its password; a revoked invitation no longer works', async () => {
    const lead = await signedIn(team.users.lead.email)
    const existing = await makeUser(ctx.dataSource, { email: uniqueEmail('existing') })
    await lead.post(`/api/studies/${team.study.id}/invitations`, { email: existing.email, role: 'partner' })
    const token = linkIn(await waitForMail(existing.email, /invited/), '/invitations')
    const anon = new Client(ctx.app)
    await anon.refreshCsrf()
    expect((await anon.get(`/api/invitations/${token}`)).body.accountExists).toBe(true)
    expect((await anon.post(`/api/invitations/${token}/accept`, { password: 'wrong password entirely' })).status).toBe(403)
    expect((await anon.post(`/api/invitations/${token}/accept`, { password: TEST_PASSWORD })).status).toBe(200)

    const revokedEmail = uniqueEmail('revoked')
    const created = await lead.post(`/api/studies/${team.study.id}/invitations`, { email: revokedEmail, role: 'coder' })
    const revokedToken = linkIn(await waitForMail(revokedEmail, /invited/), '/invitations')
    expect((await lead.delete(`/api/studies/${team.study.id}/invitations/${created.body.id}`)).status).toBe(204)
    expect((await anon.get(`/api/invitations/${revokedToken}`)).status).toBe(410)
  })

  it('refuses an e-mail address with a quoted local part or a line break (ASVS 1.3.11)', async () => {
    const lead = await signedIn(team.users.lead.email)
    for (const email of ['"a@b.org x"@internal.test', 'someone@example.org\r\nBcc: spy@example.org']) {
      const res = await lead.post(`/api/studies/${team.study.id}/invitations`, { email, role: 'coder' })
      expect(res.status).toBe(400)
      expect(res.body.errors[0].path).toBe('email')
    }
  })
})
