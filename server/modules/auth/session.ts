import type { NextFunction, Request, Response } from 'express'
import session from 'express-session'
import connectPgSimple from 'connect-pg-simple'
import type { Pool } from 'pg'
import { UnauthenticatedError } from '../../lib/errors.js'

export interface SessionSettings {
  secret: string
  secure: boolean
  idleMinutes: number
  absoluteHours: number
  pruneSessions: boolean
}

/**
 * Sessions live in PostgreSQL (connect-pg-simple, sharing the app's pool), so any app instance can
 * serve any request. The cookie is httpOnly and SameSite=Lax, `__Host-` prefixed and Secure over
 * https. `rolling` gives the idle timeout (the row's expiry moves with each request); the absolute
 * limit is checked by `enforceAbsoluteLimit`, since express-session has none (expressjs/session#557).
 */
/**
 * Moving a session's expiry is a database write on every request; doing it at most once a minute per
 * session (per app instance) keeps the idle timeout within a minute of exact for a fraction of the
 * writes. Changed sessions are still saved at once (that is `set`, not `touch`).
 */
export const TOUCH_INTERVAL_MS = 60_000

function throttledStore(PgStore: ReturnType<typeof connectPgSimple>) {
  return class ThrottledTouchStore extends PgStore {
    private readonly touchedAt = new Map<string, number>()

    override touch(sid: string, sess: session.SessionData, callback?: () => void): void {
      const now = Date.now()
      const last = this.touchedAt.get(sid)
      if (last !== undefined && now - last < TOUCH_INTERVAL_MS) return callback?.()
      if (this.touchedAt.size > 50_000) {
        for (const [key, at] of this.touchedAt) if (now - at >= TOUCH_INTERVAL_MS) this.touchedAt.delete(key)
      }
      this.touchedAt.set(sid, now)
      super.touch(sid, sess, callback)
    }
  }
}

export function createSessionMiddleware(pool: Pool, settings: SessionSettings) {
  const PgStore = throttledStore(connectPgSimple(session))
  const middleware = session({
    name: settings.secure ? '__Host-heardwell.sid' : 'heardwell.sid',
    secret: settings.secret,
    store: new PgStore({ pool, tableName: 'session', pruneSessionInterval: settings.pruneSessions ? 15 * 60 : false }),
    resave: false,
    saveUninitialized: false,
    rolling: true,
    unset: 'destroy',
    cookie: { httpOnly: true, sameSite: 'lax', secure: settings.secure, path: '/', maxAge: settings.idleMinutes * 60_000 },
  })
  return function sessionOrUnavailable(req: Request, res: Response, next: NextFunction) {
    middleware(req, res, (error?: unknown) => {
      // The session could not be read (the database is down, or its connection was cut): the error
      // handler answers 503. Forget the session id for the rest of this request, or express-session
      // (unset: 'destroy') would delete the unread session when the response ends, signing the user
      // out over a passing fault, and a failed delete would call `next` again and cut the connection.
      if (error) req.sessionID = undefined as unknown as string
      next(error)
    })
  }
}

export function enforceAbsoluteLimit(absoluteHours: number) {
  return function absoluteLimit(req: Request, _res: Response, next: NextFunction) {
    const signedInAt = req.session?.signedInAt
    if (req.user && signedInAt && Date.now() - signedInAt > absoluteHours * 3_600_000) {
      return req.session.destroy(() => next(new UnauthenticatedError('Your session has ended. Sign in again.')))
    }
    next()
  }
}
