/**
 * Errors that say what went wrong in the trade's terms. Services throw them; the error middleware
 * (middleware/errors.ts) turns them into RFC 9457 problem details.
 */
export interface FieldError {
  path: string
  message: string
}

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    readonly title: string,
    readonly detail?: string,
    readonly errors?: FieldError[],
    readonly headers: Record<string, string> = {},
  ) {
    super(detail ?? title)
  }
}

export class ValidationError extends AppError {
  constructor(detail: string, errors: FieldError[] = []) {
    super(400, 'validation', 'The request has mistakes', detail, errors)
  }
}
export class UnauthenticatedError extends AppError {
  constructor(detail = 'Sign in to continue.') {
    super(401, 'unauthenticated', 'Not signed in', detail)
  }
}
export class ForbiddenError extends AppError {
  constructor(detail = 'Your role on this study does not allow this.') {
    super(403, 'forbidden', 'Not allowed', detail)
  }
}
export class NotFoundError extends AppError {
  constructor(what = 'record') {
    super(404, 'not-found', 'Not found', `No such ${what}.`)
  }
}
export class ConflictError extends AppError {
  constructor(detail: string) {
    super(409, 'conflict', 'Conflict', detail)
  }
}
export class GoneError extends AppError {
  constructor(detail: string) {
    super(410, 'link-expired', 'This link no longer works', detail)
  }
}
export class TooManyRequestsError extends AppError {
  constructor(detail: string, retryAfterSeconds: number) {
    super(429, 'too-many-attempts', 'Too many attempts', detail, undefined, { 'Retry-After': String(retryAfterSeconds) })
  }
}
export class UnavailableError extends AppError {
  constructor(what: string) {
    super(503, 'unavailable', 'Service unavailable', `${what} is not available right now. Please try again in a minute.`)
  }
}
/** The request is well-formed but cannot be applied as it stands (a range outside the text, a retired code, a file with mistakes). */
export class UnprocessableError extends AppError {
  constructor(detail: string, errors: FieldError[] = []) {
    super(422, 'unprocessable', 'This cannot be applied as it stands', detail, errors)
  }
}
