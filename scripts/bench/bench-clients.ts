/**
 * What the load-driving benchmarks share: percentiles of response times, the app and its baseline
 * started in a process of their own (bench-server.ts), and signing in as a browser would (CSRF token
 * first, then the session cookie and the token for writes).
 */
import { spawn } from 'node:child_process'
import { createInterface } from 'node:readline'

/** The nearest-rank percentile of an ascending list (0 for an empty one). */
export function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return 0
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!
}

export interface ServerInfo {
  appPort: number
  basePort: number
  studyId: string
  databaseUrl: string
}

export interface Session {
  cookie: string
  csrf: string
}

/** Starts bench-server.ts in its own process and waits for its ports. BENCH_PROFILE=<dir> writes its CPU profile there. */
export async function startServer(): Promise<{ info: ServerInfo; pid: number; stop: () => Promise<void> }> {
  const profile = process.env.BENCH_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_PROFILE}`] : []
  const child = spawn(process.execPath, [...profile, '--import', 'tsx/esm', 'scripts/bench/bench-server.ts'], {
    stdio: ['pipe', 'pipe', 'inherit'],
    env: { ...process.env, TSX_TSCONFIG_PATH: 'tsconfig.server.json' },
  })
  const line = await new Promise<string>((resolve, reject) => {
    createInterface({ input: child.stdout! }).once('line', resolve)
    child.once('exit', (code) => reject(new Error(`bench server stopped (${code})`)))
  })
  const stop = () => new Promise<void>((resolve) => {
    child.once('exit', () => resolve())
    child.kill('SIGTERM')
  })
  return { info: JSON.parse(line) as ServerInfo, pid: child.pid!, stop }
}

/** Signs in on the app at `port` and returns the session cookie and the CSRF token for writes. */
export async function signIn(port: number, email: string, password: string): Promise<Session> {
  const csrfRes = await fetch(`http://127.0.0.1:${port}/api/auth/csrf`)
  const first = csrfRes.headers.get('set-cookie')!.split(';')[0]!
  const { token } = (await csrfRes.json()) as { token: string }
  const login = await fetch(`http://127.0.0.1:${port}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: first },
    body: JSON.stringify({ email, password }),
  })
  if (login.status !== 200) throw new Error(`sign-in of ${email}: ${login.status}`)
  return { cookie: login.headers.get('set-cookie')!.split(';')[0]!, csrf: login.headers.get('x-csrf-token') ?? token }
}
