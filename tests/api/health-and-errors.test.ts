import pg from 'pg'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest'
import { makeTeam, TEST_PASSWORD } from '../support/factories.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
})
afterAll(() => ctx?.close())

describe('health', () => {
  it('reports each dependency as ok', async () => {
    const res = await request(ctx.app).get('/api/health')
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ status: 'ok', db: 'ok', storage: 'ok', mail: 'ok' })
  })

  it('answers 503 naming the database when it cannot be reached, and recovers by itself', async () => {
    const dbName = new URL(ctx.databaseUrl).pathname.slice(1)
    const admin = new pg.Client({ host: '127.0.0.1', port: inject('pgPort'), user: 'postgres', database: 'postgres' })
    await admin.connect()
    try {
      await admin.query(`ALTER DATABASE ${dbName} ALLOW_CONNECTIONS false`)
      await admin.query(`SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = $1 AND pid <> pg_backend_pid()`, [dbName])
      const down = await request(ctx.app).get('/api/health')
      expect(down.status).toBe(503)
      expect(down.body.db).toBe('unreachable')
      expect(down.body.storage).toBe('ok')
      const page = await lead.get(`/api/studies/${team.study.id}`)
      expect(page.status, JSON.stringify(page.body)).toBe(503)
      expect(page.body.detail).toMatch(/database is not reachable/)
    } finally {
      await admin.query(`ALTER DATABASE ${dbName} ALLOW_CONNECTIONS true`)
      await admin.end()
    }
    expect((await request(ctx.app).get('/api/health')).status).toBe(200)
    expect((await lead.get(`/api/studies/${team.study.id}`)).status).toBe(200)
  })
})

describe('bad input gets problem details, never a 500', () => {
  it('malformed JSON → 400', async () => {
    const res = await lead.agent
      .patch(`/api/studies/${team.study.id}`)
      .set('X-CSRF-Token', lead.csrf)
      .set('Content-Type', 'application/json')
      .send('{"title": "unfinished')
    expect(res.status).toBe(400)
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json; charset=utf-8/)
    expect(res.body).toMatchObject({ status: 400, title: 'Malformed JSON' })
  })

  it('an oversized body → 413', async () => {
    const res = await lead.patch(`/api/studies/${team.study.id}`, { summary: 'x'.repeat(1_200_000) })
    expect(res.status).toBe(413)
    expect(res.body.status).toBe(413)
  })

  it('unknown ids → 404, a malformed id → 400, unknown fields → 400', async () => {
    expect((await lead.patch(`/api/studies/${team.study.id}/members/2b1e4c6a-0000-4000-8000-000000000000`, { role: 'coder' })).status).toBe(404)
    const admin = new Client(ctx.app)
    await admin.signIn(team.users.admin.email, TEST_PASSWORD)
    expect((await admin.get('/api/studies/2b1e4c6a-0000-4000-8000-000000000000')).status).toBe(404)
    expect((await admin.get('/api/studies/not-a-uuid')).status).toBe(400)
    const mass = await lead.patch(`/api/studies/${team.study.id}`, { title: 'ok', id: 'forged', createdAt: 'x' })
    expect(mass.status).toBe(400)
    expect(mass.body.errors[0].message).toMatch(/Unexpected field/)
  })

  it('text with a NUL character → 400 with a readable reason', async () => {
    const res = await lead.patch(`/api/studies/${team.study.id}`, { summary: 'before\u0000after' })
    expect(res.status).toBe(400)
    expect(res.body.errors[0].message).toMatch(/NUL/)
  })

  it('an unknown API route → 404 problem details; TRACE → 405', async () => {
    const res = await request(ctx.app).get('/api/no-such-thing')
    expect(res.status).toBe(404)
    expect(res.headers['content-type']).toMatch(/problem\+json/)
    expect((await request(ctx.app).trace('/api/health')).status).toBe(405)
  })
})

describe('security headers (ASVS 5.0 3.4; OWASP HTTP Headers Cheat Sheet)', () => {
  it('set a tightened content-security-policy and the other headers on API and error responses', async () => {
    for (const res of [await request(ctx.app).get('/api/health'), await request(ctx.app).get('/api/nothing-here')]) {
      const csp = res.headers['content-security-policy']
      expect(csp).toContain("object-src 'none'")
      expect(csp).toContain("base-uri 'none'")
      expect(csp).toContain("frame-ancestors 'none'")
      expect(csp).not.toContain('unsafe-eval')
      expect(res.headers['x-content-type-options']).toBe('nosniff')
      expect(res.headers['referrer-policy']).toBe('no-referrer')
      expect(res.headers['cross-origin-opener-policy']).toBe('same-origin')
      expect(res.headers['strict-transport-security']).toMatch(/max-age=31536000/)
      expect(res.headers['cache-control']).toBe('no-store')
      expect(res.headers['x-powered-by']).toBeUndefined()
    }
  })
})

describe('schema', () => {
  it('has no drift between the entities and the committed migrations', async () => {
    const pending = await ctx.dataSource.driver.createSchemaBuilder().log()
    expect(pending.upQueries.map((q) => q.query)).toEqual([])
  })
})
