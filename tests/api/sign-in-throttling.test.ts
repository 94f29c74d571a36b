import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeTeam, makeUser, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * Sign-in throttling (NIST SP 800-63B-4 §3.2.2: at most 100 consecutive failures per account;
 * ASVS 5.0 6.1.1, 6.3.1). The counts live in PostgreSQL, shared by every app instance.
 */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
beforeAll(async () => {
  // one proxy in front, so X-Forwarded-For stands for the client address
  ctx = await createTestContext({ TRUST_PROXY: '1', LOGIN_FAILURES_PER_ACCOUNT: '5', LOGIN_FAILURES_PER_ADDRESS: '8' })
  team = await makeTeam(ctx.dataSource)
})
afterAll(() => ctx?.close())

async function attempt(email: string, password: string, address: string) {
  const client = new Client(ctx.app)
  await client.refreshCsrf()
  return client.agent.post('/api/auth/login').set('X-CSRF-Token', client.csrf).set('X-Forwarded-For', address).send({ email, password })
}

describe('sign-in throttling', () => {
  it('throttles one account after repeated failures even from rotating addresses, without a permanent lock-out', async () => {
    const user = await makeUser(ctx.dataSource, { email: uniqueEmail('target') })
    const statuses: number[] = []
    for (let i = 0; i < 7; i++) statuses.push((await attempt(user.email, `wrong password number ${i}`, `203.0.113.${i + 1}`)).status)
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401])
    expect(statuses.slice(5)).toEqual([429, 429])
    // while throttled even the right password waits, and the answer says how long
    const locked = await attempt(user.email, TEST_PASSWORD, '203.0.113.50')
    expect(locked.status).toBe(429)
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0)
    expect(locked.body.detail).toMatch(/Wait \d+ minute/)
    // the count is kept in PostgreSQL, so another app instance on the same database sees it too
    const second = await createTestContext({ TRUST_PROXY: '1', LOGIN_FAILURES_PER_ACCOUNT: '5', DATABASE_URL: ctx.databaseUrl })
    try {
      const client = new Client(second.app)
      await client.refreshCsrf()
      const res = await client.agent.post('/api/auth/login').set('X-CSRF-Token', client.csrf).set('X-Forwarded-For', '198.51.100.7').send({ email: user.email, password: TEST_PASSWORD })
      expect(res.status).toBe(429)
    } finally {
      await second.close()
    }
    // not permanent: once the window has passed the right password works again
    await ctx.dataSource.query(`UPDATE rate_limits SET expire = 1 WHERE key LIKE 'signin-account:%'`)
    expect((await attempt(user.email, TEST_PASSWORD, '203.0.113.51')).status).toBe(200)
  })

  it('forgets earlier failures after a successful sign-in', async () => {
    const user = await makeUser(ctx.dataSource, { email: uniqueEmail('forgetful') })
    for (let i = 0; i < 4; i++) expect((await attempt(user.email, 'a wrong guess again', `192.0.2.${i + 1}`)).status).toBe(401)
    expect((await attempt(user.email, TEST_PASSWORD, '192.0.2.9')).status).toBe(200)
    for (let i = 0; i < 4; i++) expect((await attempt(user.email, 'a wrong guess again', `192.0.2.${i + 20}`)).status).toBe(401)
  })

  it('throttles one address that tries many accounts', async () => {
    const address = '198.51.100.200'
    const statuses: number[] = []
    for (let i = 0; i < 10; i++) statuses.push((await attempt(uniqueEmail('spray'), 'password spraying attempt', address)).status)
    expect(statuses.filter((s) => s === 401)).toHaveLength(8)
    expect(statuses.slice(8)).toEqual([429, 429])
    // another address is not affected
    expect((await attempt(team.users.lead.email, TEST_PASSWORD, '198.51.100.201')).status).toBe(200)
  })

  it('records failed and throttled sign-ins in the audit trail', async () => {
    const rows = await ctx.dataSource.query(`SELECT action, count(*)::int AS n FROM audit_events WHERE action LIKE 'auth.sign_in%' GROUP BY action`)
    const counts = Object.fromEntries(rows.map((r: { action: string; n: number }) => [r.action, r.n]))
    expect(counts['auth.sign_in_failed']).toBeGreaterThanOrEqual(13)
    expect(counts['auth.sign_in_throttled']).toBeGreaterThanOrEqual(3)
  })
})
