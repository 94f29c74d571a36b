import type { z } from 'zod'
import { csrfResponse } from '@shared/schemas/auth'
import { problemSchema } from '@shared/schemas/common'
import { ApiError } from './errors'

/**
 * The one fetch wrapper: same-origin `/api`, cookie session, JSON in and out, CSRF token on every
 * state-changing call, problem+json turned into ApiError, answers checked against the zod schema.
 */
type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'
export type QueryParams = Record<string, string | number | boolean | null | undefined>

const BASE = '/api'
let csrfToken: Promise<string> | null = null
let sessionEnded: () => void = () => {}

/** Called when a read answers 401: the session expired or was signed out elsewhere. */
export function onSessionEnded(handler: () => void): void {
  sessionEnded = handler
}

/** The session id rotates at sign-in, sign-out and password change: its token goes with it. */
export function dropCsrfToken(): void {
  csrfToken = null
}

function loadCsrfToken(): Promise<string> {
  csrfToken ??= request('GET', '/auth/csrf', undefined, undefined, csrfResponse)
    .then((answer) => answer.token)
    .catch((error: unknown) => {
      csrfToken = null
      throw error
    })
  return csrfToken
}

function urlOf(path: string, query?: QueryParams): string {
  const params = new URLSearchParams()
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined && value !== null && value !== '') params.set(key, String(value))
  }
  const search = params.toString()
  return `${BASE}${path}${search ? `?${search}` : ''}`
}

function problemOf(status: number, body: unknown): ApiError {
  const parsed = problemSchema.safeParse(body)
  if (parsed.success) return new ApiError(parsed.data)
  return new ApiError({
    type: 'about:blank',
    status,
    title: status >= 500 ? 'Heardwell had a problem on its side. Try again in a moment.' : `The request was refused (${status}).`,
  })
}

async function problemFrom(response: Response): Promise<ApiError> {
  return problemOf(response.status, await response.json().catch(() => null))
}

function unreadable(status: number): ApiError {
  return new ApiError({ type: 'unreadable-response', status, title: 'Heardwell sent an answer this page could not read. Reload the page and try again.' })
}

async function request<S extends z.ZodType>(
  method: Method,
  path: string,
  body: unknown,
  query: QueryParams | undefined,
  schema: S | undefined,
  retried = false,
): Promise<z.output<S>> {
  const headers: Record<string, string> = { Accept: 'application/json' }
  if (body !== undefined) headers['Content-Type'] = 'application/json'
  if (method !== 'GET') headers['X-CSRF-Token'] = await loadCsrfToken()

  let response: Response
  try {
    response = await fetch(urlOf(path, query), {
      method,
      headers,
      credentials: 'include',
      body: body === undefined ? undefined : JSON.stringify(body),
    })
  } catch {
    throw ApiError.unreachable()
  }

  if (!response.ok) {
    const error = await problemFrom(response)
    if (response.status === 403 && error.type.endsWith('csrf') && !retried) {
      dropCsrfToken()
      return request(method, path, body, query, schema, true)
    }
    // Only reads: a 401 on a form post can mean "wrong current password", which the form explains itself.
    if (response.status === 401 && method === 'GET' && path !== '/auth/me') sessionEnded()
    throw error
  }
  if (!schema || response.status === 204 || response.status === 202) return undefined as z.output<S>

  const payload: unknown = await response.json().catch(() => undefined)
  const parsed = schema.safeParse(payload)
  if (!parsed.success) throw unreadable(response.status)
  return parsed.data
}

/** Called while a file goes up, with the share sent so far (0 to 1). */
export type UploadProgress = (fraction: number) => void

interface RawAnswer {
  status: number
  body: unknown
}

/** fetch cannot report upload progress, so files go up through XMLHttpRequest. */
function send(path: string, form: FormData, token: string, onProgress?: UploadProgress): Promise<RawAnswer> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', urlOf(path))
    xhr.withCredentials = true
    xhr.setRequestHeader('Accept', 'application/json')
    xhr.setRequestHeader('X-CSRF-Token', token)
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0) onProgress?.(event.loaded / event.total)
    }
    xhr.onload = () => {
      let body: unknown = null
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null
      } catch {
        body = null
      }
      resolve({ status: xhr.status, body })
    }
    xhr.onerror = () => reject(ApiError.unreachable())
    xhr.onabort = () => reject(ApiError.unreachable())
    xhr.send(form)
  })
}

/** A multipart POST (a file and its `metadata`), with the same CSRF handling and problem details as `request`. */
async function upload<S extends z.ZodType>(path: string, form: FormData, schema: S, onProgress?: UploadProgress, retried = false): Promise<z.output<S>> {
  const answer = await send(path, form, await loadCsrfToken(), onProgress)
  if (answer.status < 200 || answer.status >= 300) {
    const error = problemOf(answer.status, answer.body)
    if (answer.status === 403 && error.type.endsWith('csrf') && !retried) {
      dropCsrfToken()
      return upload(path, form, schema, onProgress, true)
    }
    throw error
  }
  onProgress?.(1)
  const parsed = schema.safeParse(answer.body)
  if (!parsed.success) throw unreadable(answer.status)
  return parsed.data
}

export const http = {
  get: <S extends z.ZodType>(path: string, schema: S, query?: QueryParams) => request('GET', path, undefined, query, schema),
  post: <S extends z.ZodType>(path: string, body: unknown, schema?: S) => request('POST', path, body, undefined, schema),
  put: <S extends z.ZodType>(path: string, body: unknown, schema?: S) => request('PUT', path, body, undefined, schema),
  patch: <S extends z.ZodType>(path: string, body: unknown, schema?: S) => request('PATCH', path, body, undefined, schema),
  delete: (path: string) => request('DELETE', path, undefined, undefined, undefined),
  upload,
}

/** Encodes one path segment taken from a route or a record. */
export const segment = (value: string): string => encodeURIComponent(value)
