/**
 * A signed-in user talking to the app over real HTTP (fetch), with a bound on every request so a hang
 * shows up as a failure of its own kind rather than stalling the drill.
 */
export interface Answer {
  /** 0 when no answer came: the connection failed or the time bound passed */
  status: number
  contentType: string
  body: any
  text: string
  ms: number
  /** set when no HTTP answer came */
  failure?: 'timeout' | 'network'
}

export class Session {
  cookie = ''
  csrf = ''

  constructor(
    readonly baseUrl: string,
    readonly timeoutMs = 15_000,
  ) {}

  static async signIn(baseUrl: string, email: string, password: string): Promise<Session> {
    const session = new Session(baseUrl)
    const csrf = await session.request('GET', '/api/auth/csrf')
    if (csrf.status !== 200) throw new Error(`csrf: ${csrf.status} ${csrf.text}`)
    session.csrf = csrf.body.token
    const login = await session.request('POST', '/api/auth/login', { email, password })
    if (login.status !== 200) throw new Error(`sign-in of ${email}: ${login.status} ${login.text}`)
    return session
  }

  get(path: string) {
    return this.request('GET', path)
  }
  post(path: string, body?: unknown) {
    return this.request('POST', path, body)
  }

  async request(method: string, path: string, body?: unknown, form?: FormData): Promise<Answer> {
    const started = performance.now()
    const headers: Record<string, string> = {}
    if (this.cookie) headers.cookie = this.cookie
    if (method !== 'GET' && this.csrf) headers['x-csrf-token'] = this.csrf
    if (body !== undefined) headers['content-type'] = 'application/json'
    try {
      const res = await fetch(this.baseUrl + path, {
        method,
        headers,
        body: form ?? (body === undefined ? undefined : JSON.stringify(body)),
        signal: AbortSignal.timeout(this.timeoutMs),
      })
      const setCookie = res.headers.get('set-cookie')
      if (setCookie) this.cookie = setCookie.split(';')[0]!
      const token = res.headers.get('x-csrf-token')
      if (token) this.csrf = token
      const text = await res.text()
      const contentType = res.headers.get('content-type') ?? ''
      let parsed: unknown = null
      if (/json/.test(contentType) && text) parsed = JSON.parse(text)
      return { status: res.status, contentType, body: parsed, text, ms: performance.now() - started }
    } catch (error) {
      const name = (error as Error).name
      const cause = (error as { cause?: { code?: string; message?: string } }).cause
      return { status: 0, contentType: '', body: null, text: `${String(error)}${cause ? ` (${cause.code ?? ''} ${cause.message ?? ''})` : ''}`, ms: performance.now() - started, failure: name === 'TimeoutError' || name === 'AbortError' ? 'timeout' : 'network' }
    }
  }
}

/** Polls `check` until it returns true, or throws after `timeoutMs`. */
export async function until(check: () => Promise<boolean> | boolean, timeoutMs: number, what: string, everyMs = 200): Promise<number> {
  const started = Date.now()
  while (Date.now() - started < timeoutMs) {
    if (await check()) return Date.now() - started
    await sleep(everyMs)
  }
  throw new Error(`${what}: not within ${timeoutMs} ms`)
}

export const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms))
