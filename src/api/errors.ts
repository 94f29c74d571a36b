import type { Problem } from '@shared/schemas/common'

export const UNREACHABLE_MESSAGE = 'Heardwell cannot be reached. Check your connection and try again.'

/** A failed call: the server's RFC 9457 problem details, or a stand-in when there was no answer. */
export class ApiError extends Error {
  readonly status: number
  readonly type: string
  readonly title: string
  readonly detail?: string
  readonly errors: { path: string; message: string }[]

  constructor(problem: Problem) {
    super(problem.detail || problem.title)
    this.name = 'ApiError'
    this.status = problem.status
    this.type = problem.type
    this.title = problem.title
    this.detail = problem.detail
    this.errors = problem.errors ?? []
  }

  /** The server answered with this problem type (compared on the last path segment). */
  is(kind: string): boolean {
    return this.type === kind || this.type.endsWith(`/${kind}`) || this.type.endsWith(kind)
  }

  static unreachable(): ApiError {
    return new ApiError({ type: 'network', title: UNREACHABLE_MESSAGE, status: 0 })
  }
}

/** A readable sentence for any thrown value. */
export function messageOf(error: unknown): string {
  if (error instanceof ApiError) return error.message
  return 'Something went wrong in Heardwell. Try again; if it keeps happening, tell your site administrator.'
}

declare module '@pinia/colada' {
  interface TypesConfig {
    defaultError: ApiError
  }
}
