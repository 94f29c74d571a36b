import { afterEach, describe, expect, it, vi } from 'vitest'
import { z } from 'zod'
import { ApiError } from '@/api/errors'
import { dropCsrfToken, http, onSessionEnded } from '@/api/http'
import { stubFetch } from './support'

describe('the fetch wrapper', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    dropCsrfToken()
  })

  it('fetches a new CSRF token once and retries when the server refuses the old one', async () => {
    const { calls } = stubFetch({
      'GET /api/auth/csrf': [
        { status: 200, body: { token: 'old' } },
        { status: 200, body: { token: 'new' } },
      ],
      'POST /api/users': [
        { status: 403, body: { type: 'https://heardwell.test/problems/csrf', title: 'Forbidden', status: 403 } },
        { status: 201, body: { ok: true } },
      ],
    })
    const answer = await http.post('/users', { name: 'x' }, z.object({ ok: z.boolean() }))
    expect(answer).toEqual({ ok: true })
    const posts = calls.filter((c) => c.method === 'POST')
    expect(posts.map((c) => c.headers['X-CSRF-Token'])).toEqual(['old', 'new'])
  })

  it('does not send a CSRF token on reads and sends cookies on every call', async () => {
    const { fetchStub } = stubFetch({ 'GET /api/health': { status: 200, body: { status: 'ok' } } })
    await http.get('/health', z.object({ status: z.string() }))
    const init = fetchStub.mock.calls[0][1] as RequestInit
    expect(init.credentials).toBe('include')
    expect((init.headers as Record<string, string>)['X-CSRF-Token']).toBeUndefined()
  })

  it('turns problem details into an ApiError that keeps the field errors', async () => {
    stubFetch({
      'GET /api/auth/csrf': { status: 200, body: { token: 't' } },
      'POST /api/studies': {
        status: 400,
        body: { type: '/problems/validation', title: 'Check the form', status: 400, errors: [{ path: 'code', message: 'Use letters.' }] },
      },
    })
    const error = await http.post('/studies', {}).catch((e: unknown) => e)
    expect(error).toBeInstanceOf(ApiError)
    expect((error as ApiError).status).toBe(400)
    expect((error as ApiError).errors).toEqual([{ path: 'code', message: 'Use letters.' }])
  })

  it('says Heardwell cannot be reached when the network fails', async () => {
    stubFetch({ 'GET /api/health': new TypeError('Failed to fetch') })
    await expect(http.get('/health', z.object({}))).rejects.toThrow('Heardwell cannot be reached. Check your connection and try again.')
  })

  it('reports an ended session when a read answers 401, but not when a form post does', async () => {
    const ended = vi.fn()
    onSessionEnded(ended)
    const unauthenticated = { status: 401, body: { type: '/problems/unauthenticated', title: 'Sign in', status: 401 } }
    stubFetch({ 'GET /api/auth/csrf': { status: 200, body: { token: 't' } }, 'POST /api/auth/password': unauthenticated, 'GET /api/studies': unauthenticated })
    await http.post('/auth/password', {}).catch(() => undefined)
    expect(ended).not.toHaveBeenCalled()
    await http.get('/studies', z.object({})).catch(() => undefined)
    expect(ended).toHaveBeenCalledOnce()
    onSessionEnded(() => {})
  })
})
