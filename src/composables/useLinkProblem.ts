import { ApiError } from '@/api/errors'

/** An e-mailed link (password reset, invitation) that has expired, was used, or never existed. */
export function isSpentLink(error: unknown): boolean {
  if (!(error instanceof ApiError)) return false
  if (error.status === 404 || error.status === 410) return true
  if (error.errors.some((item) => item.path.split(/[./]/).includes('token'))) return true
  return /link-expired|token/i.test(error.type)
}

export function useLinkProblem() {
  return { isSpentLink }
}
