import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeTeam, TEST_PASSWORD } from '../support/factories.js'
import { listRoutes } from '../support/routes.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * CSRF on every state-changing route (OWASP WSTG-SESS-05; reference/security.md): each POST, PUT,
 * PATCH and DELETE registered in Express, called by a signed-in lead without the token, is refused
 * with 403 before it does anything. The list of routes comes from the router, not from a hand list.
 */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  expect((await lead.signIn(team.users.lead.email, TEST_PASSWORD)).status).toBe(200)
})
afterAll(() => ctx?.close())

describe('CSRF protection', () => {
  it('refuses every state-changing API route without the token', async () => {
    const writes = listRoutes(ctx.app).filter((r) => r.path.startsWith('/api/') && r.method !== 'GET' && r.method !== 'HEAD')
    expect(writes.length).toBeGreaterThan(60)
    const accepted: string[] = []
    for (const route of writes) {
      const path = route.path.replace(':studyId', team.study.id).replace(/:[A-Za-z]+/g, () => randomUUID())
      const method = route.method.toLowerCase() as 'post' | 'put' | 'patch' | 'delete'
      const res = await lead.agent[method](path).set('Content-Type', 'application/json').send('{}')
      if (res.status !== 403 || !String(res.body?.type).endsWith('/csrf')) accepted.push(`${route.method} ${route.path}: ${res.status} ${res.body?.type ?? ''}`)
    }
    expect(accepted).toEqual([])
  })
})
