import type { NextFunction, Request, Response } from 'express'
import session from 'express-session'
import connectPgSimple from 'connect-pg-simple'
import type { Pool } from 'pg'
import type { StudyRole } from '../../../shared/permissions.js'
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

const STUDY_PATH = /^\/studies\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})(?:\/|$)/i

/**
 * The session row, its account (with the disabled flag) and the account's membership of the study in
 * the path, in one statement: every request needs all three, and asking for them one after another
 * cost two more round trips. All three are read fresh on every request (a removed member or a
 * disabled account loses access on the very next one, ASVS 8.3.2); nothing is kept between requests.
 */
const SESSION_WITH_ACCOUNT = `
  SELECT s.sess, u.id AS user_id, u.email, u.name, u.site_admin, u.disabled, m.role
    FROM "session" s
    LEFT JOIN users u ON u.id = CASE WHEN s.sess->'passport'->>'user' ~* '^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$'
                                     THEN (s.sess->'passport'->>'user')::uuid END
    LEFT JOIN memberships m ON m.user_id = u.id AND m.study_id = $3::uuid
   WHERE s.sid = $1 AND s.expire >= to_timestamp($2)`

interface SessionWithAccountRow {
  sess: session.SessionData | string
  user_id: string | null
  email: string | null
  name: string | null
  site_admin: boolean | null
  disabled: boolean | null
  role: StudyRole | null
}

function throttledStore(PgStore: ReturnType<typeof connectPgSimple>, pool: Pool) {
  return class ThrottledTouchStore extends PgStore {
    private readonly touchedAt = new Map<string, number>()
    /** the request whose session express-session is about to read (it calls `get` synchronously) */
    reading: Request | null = null

    /**
     * The session as connect-pg-simple reads it, and, in the same statement, the account and study
     * membership for this request (`req.account`, used by passport.ts and the authorize guard).
     */
    override get(sid: string, callback: (error: unknown, session?: session.SessionData | null) => void): void {
      const req = this.reading
      this.reading = null
      if (!req) return super.get(sid, callback)
      const studyId = STUDY_PATH.exec(req.path)?.[1] ?? null
      // a named statement: each connection plans it once instead of on every request
      pool.query<SessionWithAccountRow>({ name: 'session-with-account', text: SESSION_WITH_ACCOUNT, values: [sid, Math.ceil(Date.now() / 1000), studyId] }).then(
        ({ rows: [row] }) => {
          if (!row) return callback(null)
          let sess: session.SessionData
          try {
            sess = typeof row.sess === 'string' ? (JSON.parse(row.sess) as session.SessionData) : row.sess
          } catch {
            return this.destroy(sid, callback)
          }
          const named = (sess as { passport?: { user?: unknown } }).passport?.user
          req.account = {
            userId: typeof named === 'string' ? named : null,
            user: row.user_id ? { id: row.user_id, email: row.email!, name: row.name!, siteAdmin: row.site_admin!, disabled: row.disabled! } : null,
            studyId,
            role: row.role,
          }
          callback(null, sess)
        },
        (error: unknown) => callback(error),
      )
    }

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
  const PgStore = throttledStore(connectPgSimple(session), pool)
  const store = new PgStore({ pool, tableName: 'session', pruneSessionInterval: settings.pruneSessions ? 15 * 60 : false })
  const middleware = session({
    name: settings.secure ? '__Host-heardwell.sid' : 'heardwell.sid',
    secret: settings.secret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    unset: 'destroy',
    cookie: { httpOnly: true, sameSite: 'lax', secure: settings.secure, path: '/', maxAge: settings.idleMinutes * 60_000 },
  })
  return function sessionOrUnavailable(req: Request, res: Response, next: NextFunction) {
    req.account = undefined
    // express-session reads the session (store.get) synchronously inside this call, or not at all
    store.reading = req
    middleware(req, res, (error?: unknown) => {
      // The session could not be read (the database is down, or its connection was cut): the error
      // handler answers 503. Forget the session id for the rest of this request, or express-session
      // (unset: 'destroy') would delete the unread session when the response ends, signing the user
      // out over a passing fault, and a failed delete would call `next` again and cut the connection.
      if (error) req.sessionID = undefined as unknown as string
      next(error)
    })
    store.reading = null
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
