import { afterEach, describe, expect, it, vi } from 'vitest'
import { z } from 'zod'
import { ApiError } from '@/api/errors'
import { dropCsrfToken, http } from '@/api/http'
import { stubFetch } from './support'

interface Sent {
  method: string
  url: string
  headers: Record<string, string>
  body: unknown
  withCredentials: boolean
}

/** A stand-in XMLHttpRequest: reports two progress steps, then answers with the queued reply. */
function stubXhr(replies: { status: number; body: unknown }[]) {
  const sent: Sent[] = []
  class FakeXhr {
    status = 0
    responseText = ''
    withCredentials = false
    upload: { onprogress: ((event: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null }
    onload: (() => void) | null = null
    onerror: (() => void) | null = null
    onabort: (() => void) | null = null
    private request: Sent = { method: '', url: '', headers: {}, body: null, withCredentials: false }
    open(method: string, url: string) {
      this.request = { ...this.request, method, url }
    }
    setRequestHeader(name: string, value: string) {
      this.request.headers[name] = value
    }
    send(body: unknown) {
      sent.push({ ...this.request, body, withCredentials: this.withCredentials })
      const reply = replies.shift()!
      queueMicrotask(() => {
        this.upload.onprogress?.({ lengthComputable: true, loaded: 50, total: 100 })
        this.upload.onprogress?.({ lengthComputable: true, loaded: 100, total: 100 })
        this.status = reply.status
        this.responseText = JSON.stringify(reply.body)
        this.onload?.()
      })
    }
  }
  vi.stubGlobal('XMLHttpRequest', FakeXhr)
  return sent
}

describe('the upload helper', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    dropCsrfToken()
  })

  it('sends the form with the CSRF token and cookies, and reports progress', async () => {
    stubFetch({ 'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } } })
    const sent = stubXhr([{ status: 201, body: { id: 'f-1' } }])
    const steps: number[] = []
    const form = new FormData()
    form.append('metadata', '{}')
    const answer = await http.upload('/studies/s/consent-forms', form, z.object({ id: z.string() }), (f) => steps.push(f))
    expect(answer).toEqual({ id: 'f-1' })
    expect(sent[0]).toMatchObject({ method: 'POST', url: '/api/studies/s/consent-forms', withCredentials: true, body: form })
    expect(sent[0].headers['X-CSRF-Token']).toBe('csrf-1')
    expect(steps).toEqual([0.5, 1, 1])
  })

  it('turns a refused file into an ApiError with the server’s detail', async () => {
    stubFetch({ 'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } } })
    stubXhr([{ status: 415, body: { type: '/problems/unsupported-file', title: 'Not a PDF', status: 415, detail: 'Upload a PDF or a Word file.' } }])
    const error = await http.upload('/studies/s/consent-forms', new FormData(), z.object({})).catch((e: unknown) => e)
    expect(error).toBeInstanceOf(ApiError)
    expect((error as ApiError).status).toBe(415)
    expect((error as ApiError).message).toBe('Upload a PDF or a Word file.')
  })

  it('fetches a new CSRF token once and sends again when the server refuses the old one', async () => {
    stubFetch({ 'GET /api/auth/csrf': [{ status: 200, body: { token: 'old' } }, { status: 200, body: { token: 'new' } }] })
    const sent = stubXhr([
      { status: 403, body: { type: '/problems/csrf', title: 'Forbidden', status: 403 } },
      { status: 201, body: {} },
    ])
    await http.upload('/x', new FormData(), z.object({}))
    expect(sent.map((s) => s.headers['X-CSRF-Token'])).toEqual(['old', 'new'])
  })
})
