import type { NextFunction, Request, Response } from 'express'
import { AppError } from '../lib/errors.js'
import type { Logger } from '../lib/logger.js'

const PROBLEM_BASE = 'https://heardwell.test/problems/'

/** Errors that mean the database (or the session store in it) cannot be reached right now. */
export function isDatabaseUnavailable(error: unknown): boolean {
  const e = error as { code?: string; message?: string }
  const codes = ['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', '57P01', '57P02', '57P03', '08000', '08003', '08006', '08001', '08004', '53300']
  if (e?.code && codes.includes(e.code)) return true
  // "timeout exceeded when trying to connect": every pooled connection stayed busy past the pool's wait
  return /Connection terminated|connection timeout|timeout exceeded when trying to connect|Client has encountered a connection error|terminating connection|the database system is (starting up|shutting down)|not currently accepting connections/i.test(
    e?.message ?? '',
  )
}

/**
 * Errors from the object store's client (the AWS SDK marks them with `$metadata`) meaning the store
 * cannot be reached or failed on its side, as opposed to refusing this request.
 */
export function isStorageUnavailable(error: unknown): boolean {
  const e = error as { $metadata?: { httpStatusCode?: number }; code?: string; name?: string }
  if (!e?.$metadata) return false
  const status = e.$metadata.httpStatusCode
  return status === undefined || status >= 500 || e.name === 'TimeoutError'
}

function send(res: Response, req: Request, status: number, type: string, title: string, detail?: string, extra: object = {}) {
  res
    .status(status)
    .type('application/problem+json; charset=utf-8')
    .send(JSON.stringify({ type: PROBLEM_BASE + type, title, status, detail, instance: req.requestId, ...extra }))
}

/** Unknown /api routes answer with problem details, not the client's HTML. */
export function apiNotFound(req: Request, res: Response) {
  send(res, req, 404, 'not-found', 'Not found', `There is no ${req.method} ${req.path} in the Heardwell API.`)
}

/** The one error middleware: RFC 9457 problem details, never a stack trace outside development. */
export function createErrorHandler(log: Logger, exposeDetails: boolean) {
  return function errorHandler(error: unknown, req: Request, res: Response, next: NextFunction) {
    if (res.headersSent) return next(error)
    if (error instanceof AppError) {
      for (const [name, value] of Object.entries(error.headers)) res.setHeader(name, value)
      return send(res, req, error.status, error.type, error.title, error.detail, error.errors ? { errors: error.errors } : {})
    }
    const e = error as { type?: string; status?: number; code?: string; message?: string }
    if (e?.type === 'entity.parse.failed') {
      return send(res, req, 400, 'malformed-json', 'Malformed JSON', 'The request body is not valid JSON.')
    }
    if (e?.type === 'entity.too.large' || e?.code === 'LIMIT_FILE_SIZE') {
      return send(res, req, 413, 'too-large', 'Too large', 'The request is larger than Heardwell accepts here.')
    }
    if (e?.type === 'charset.unsupported' || e?.type === 'encoding.unsupported') {
      return send(res, req, 415, 'unsupported-encoding', 'Unsupported encoding', 'Send the request as UTF-8 JSON.')
    }
    if (typeof e?.status === 'number' && e.status >= 400 && e.status < 500) {
      return send(res, req, e.status, 'client-error', 'The request could not be served', 'Check the address and try again.')
    }
    // before the database check: a refused connection to the object store has the same error code
    if (isStorageUnavailable(error)) {
      log.error({ err: e?.message, requestId: req.requestId }, 'file storage unavailable')
      return send(res, req, 503, 'unavailable', 'Service unavailable', 'File storage is not available right now. Please try again in a minute.')
    }
    if (isDatabaseUnavailable(error)) {
      log.error({ err: e?.message, requestId: req.requestId }, 'database unavailable')
      return send(res, req, 503, 'unavailable', 'Service unavailable', 'The database is not reachable right now. Please try again in a minute.')
    }
    if (e?.code === '22021' || e?.code === '22P05') {
      return send(res, req, 400, 'validation', 'The request has mistakes', 'The text contains characters that cannot be stored.')
    }
    log.error({ err: error, requestId: req.requestId, path: req.originalUrl }, 'unexpected error')
    send(
      res,
      req,
      500,
      'internal',
      'Something went wrong',
      exposeDetails ? String(e?.message) : `Heardwell could not finish this request. If it happens again, quote reference ${req.requestId}.`,
    )
  }
}
