import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
})
afterAll(() => ctx?.close())

function sessionCookie(res: request.Response): string | undefined {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? [])
  return cookies.find((c) => c.startsWith('heardwell.sid='))
}

describe('sign-in', () => {
  it('signs in with the right password and answers me with the memberships', async () => {
    const client = new Client(ctx.app)
    const res = await client.signIn(team.users.lead.email, TEST_PASSWORD)
    expect(res.status).toBe(200)
    expect(res.body.user.email).toBe(team.users.lead.email)
    expect(res.body.memberships).toEqual([expect.objectContaining({ studyId: team.study.id, role: 'lead' })])
    expect((await client.get('/api/auth/me')).body.user.id).toBe(team.users.lead.id)
  })

  it('gives the same answer for an unknown e-mail and a wrong password (ASVS 6.3.8)', async () => {
    const wrong = await new Client(ctx.app).signIn(team.users.coder.email, 'not the password at all!')
    const unknown = await new Client(ctx.app).signIn(uniqueEmail('nobody'), 'not the password at all!')
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.detail).toBe(unknown.body.detail)
    expect(wrong.body.title).toBe(unknown.body.title)
    expect(wrong.headers['content-type']).toMatch(/^application\/problem\+json/)
  })

  it('refuses a disabled account and ends its sessions', async () => {
    const admin = new Client(ctx.app)
    await admin.signIn(team.users.admin.email, TEST_PASSWORD)
    const partner = new Client(ctx.app)
    await partner.signIn(team.users.partner.email, TEST_PASSWORD)
    expect((await admin.patch(`/api/users/${team.users.partner.id}`, { disabled: true })).status).toBe(200)
    expect((await partner.get('/api/auth/me')).status).toBe(401)
    expect((await new Client(ctx.app).signIn(team.users.partner.email, TEST_PASSWORD)).status).toBe(401)
    await admin.patch(`/api/users/${team.users.partner.id}`, { disabled: false })
  })

  it('issues a new session id at sign-in, so a planted cookie stays anonymous (session fixation)', async () => {
    const client = new Client(ctx.app)
    const before = sessionCookie(await client.agent.get('/api/auth/csrf'))!
    expect(before).toBeDefined()
    const login = await client.signIn(team.users.coder.email, TEST_PASSWORD)
    const after = sessionCookie(login)!
    expect(after.split(';')[0]).not.toBe(before.split(';')[0])
    const replay = await request(ctx.app).get('/api/auth/me').set('Cookie', before.split(';')[0]!)
    expect(replay.status).toBe(401)
  })

  it('sets the session cookie httpOnly and SameSite=Lax with the idle lifetime', async () => {
    const res = await new Client(ctx.app).signIn(team.users.coder.email, TEST_PASSWORD)
    const cookie = sessionCookie(res)!
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).toMatch(/Path=\//)
    expect(cookie).not.toMatch(/Domain=/i)
  })

  it('uses a __Host- prefixed Secure cookie when the public address is https (ASVS 3.3.1, 3.3.3)', async () => {
    const https = await createTestContext({ PUBLIC_URL: 'https://heardwell.example.org', TRUST_PROXY: '1' })
    try {
      const res = await request(https.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https')
      const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('__Host-heardwell.sid='))
      expect(cookie).toBeDefined()
      expect(cookie).toMatch(/; Secure/i)
      expect(cookie).toMatch(/HttpOnly/i)
      expect(cookie).not.toMatch(/Domain=/i)
      expect(res.headers['strict-transport-security']).toMatch(/max-age=31536000; includeSubDomains/)
    } finally {
      await https.close()
    }
  })

  it('sign-out destroys the session row; the old cookie no longer works', async () => {
    const client = new Client(ctx.app)
    const login = await client.signIn(team.users.coordinator.email, TEST_PASSWORD)
    const cookie = sessionCookie(login)!.split(';')[0]!
    const sid = decodeURIComponent(cookie.split('=')[1]!).slice(2).split('.')[0]
    expect((await ctx.dataSource.query('SELECT count(*)::int AS n FROM session WHERE sid = $1', [sid]))[0].n).toBe(1)
    expect((await client.post('/api/auth/logout')).status).toBe(204)
    expect((await ctx.dataSource.query('SELECT count(*)::int AS n FROM session WHERE sid = $1', [sid]))[0].n).toBe(0)
    expect((await request(ctx.app).get('/api/auth/me').set('Cookie', cookie)).status).toBe(401)
  })

  it('ends a session that has been idle past its limit (server-side expiry)', async () => {
    const client = new Client(ctx.app)
    await client.signIn(team.users.coder.email, TEST_PASSWORD)
    expect((await client.get('/api/auth/me')).status).toBe(200)
    await ctx.dataSource.query(`UPDATE session SET expire = now() - interval '1 second' WHERE sess->'passport'->>'user' = $1`, [team.users.coder.id])
    expect((await client.get('/api/auth/me')).status).toBe(401)
  })

  it('moves the idle expiry at most once a minute per session, not on every request', async () => {
    const client = new Client(ctx.app)
    await client.signIn(team.users.lead.email, TEST_PASSWORD)
    const expiry = async () => (await ctx.dataSource.query(`SELECT expire FROM session WHERE sess->'passport'->>'user' = $1 ORDER BY expire DESC LIMIT 1`, [team.users.lead.id]))[0].expire.getTime()
    expect((await client.get('/api/auth/me')).status).toBe(200) // the first request moves it
    const moved = await expiry()
    await new Promise((r) => setTimeout(r, 1100))
    expect((await client.get('/api/auth/me')).status).toBe(200)
    expect(await expiry()).toBe(moved) // within the minute: no write
  })

  it('ends a session past the absolute limit however active it is', async () => {
    const client = new Client(ctx.app)
    await client.signIn(team.users.partner.email, TEST_PASSWORD)
    const thirteenHoursAgo = Date.now() - 13 * 3_600_000
    await ctx.dataSource.query(
      `UPDATE session SET sess = jsonb_set(sess::jsonb, '{signedInAt}', to_jsonb($2::bigint))::json WHERE sess->'passport'->>'user' = $1`,
      [team.users.partner.id, thirteenHoursAgo],
    )
    const res = await client.get('/api/auth/me')
    expect(res.status).toBe(401)
    expect(res.body.detail).toMatch(/session has ended/i)
  })

  it('"sign out everywhere else" ends the other sessions and keeps this one', async () => {
    const here = new Client(ctx.app)
    const there = new Client(ctx.app)
    await here.signIn(team.users.lead.email, TEST_PASSWORD)
    await there.signIn(team.users.lead.email, TEST_PASSWORD)
    expect((await here.post('/api/auth/sessions/revoke-others')).status).toBe(204)
    expect((await here.get('/api/auth/me')).status).toBe(200)
    expect((await there.get('/api/auth/me')).status).toBe(401)
  })
})

describe('CSRF protection', () => {
  it('refuses a state-changing request without the token, or with another session\'s token', async () => {
    const client = new Client(ctx.app)
    await client.signIn(team.users.lead.email, TEST_PASSWORD)
    const body = { title: 'Changed without a token' }
    const none = await client.agent.patch(`/api/studies/${team.study.id}`).send(body)
    expect(none.status).toBe(403)
    expect(none.body.type).toMatch(/csrf$/)
    const other = new Client(ctx.app)
    const foreign = await other.refreshCsrf()
    expect((await client.agent.patch(`/api/studies/${team.study.id}`).set('X-CSRF-Token', foreign).send(body)).status).toBe(403)
    expect((await client.patch(`/api/studies/${team.study.id}`, { summary: 'with the token' })).status).toBe(200)
  })

  it('does not accept the token issued before sign-in once the session id rotates', async () => {
    const client = new Client(ctx.app)
    const before = await client.refreshCsrf()
    await client.signIn(team.users.lead.email, TEST_PASSWORD)
    expect(client.csrf).not.toBe(before)
    const res = await client.agent.patch(`/api/studies/${team.study.id}`).set('X-CSRF-Token', before).send({ summary: 'x' })
    expect(res.status).toBe(403)
  })

  it('refuses cross-site origins and non-JSON bodies on writes', async () => {
    const client = new Client(ctx.app)
    await client.signIn(team.users.lead.email, TEST_PASSWORD)
    const evil = await client.agent
      .patch(`/api/studies/${team.study.id}`)
      .set('X-CSRF-Token', client.csrf)
      .set('Origin', 'https://evil.example')
      .send({ summary: 'x' })
    expect(evil.status).toBe(403)
    const plain = await client.agent
      .patch(`/api/studies/${team.study.id}`)
      .set('X-CSRF-Token', client.csrf)
      .set('Content-Type', 'text/plain')
      .send('{"summary":"x"}')
    expect(plain.status).toBe(415)
  })
})
