import { afterEach, describe, expect, it, vi } from 'vitest'
import { createMemoryHistory, createRouter } from 'vue-router'
import { accessGuard } from '@/router'
import { routes } from '@/router/routes'
import { createTestApp, signInAs, stubFetch } from './support'

async function resolve(path: string) {
  const router = createRouter({ history: createMemoryHistory(), routes })
  return accessGuard(router.resolve(path))
}

describe('route access', () => {
  afterEach(() => vi.unstubAllGlobals())

  it('sends a signed-out visitor to sign in and back to the page afterwards', async () => {
    stubFetch({ 'GET /api/auth/me': { status: 401, body: { type: '/problems/unauthenticated', title: 'Sign in', status: 401 } } })
    createTestApp()
    expect(await resolve('/studies/study-1/team')).toEqual({ name: 'sign-in', query: { redirect: '/studies/study-1/team' } })
  })

  it('shows "not allowed" to a coder who opens the audit trail, and lets the lead in', async () => {
    createTestApp()
    signInAs('coder')
    expect(await resolve('/studies/study-1/audit')).toMatchObject({ name: 'not-allowed' })
    signInAs('lead')
    expect(await resolve('/studies/study-1/audit')).toBe(true)
  })

  it('keeps site administration for the site administrator', async () => {
    createTestApp()
    signInAs('lead')
    expect(await resolve('/admin')).toMatchObject({ name: 'not-allowed' })
    signInAs(null, true)
    expect(await resolve('/admin')).toBe(true)
  })
})
