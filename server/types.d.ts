import 'express-session'
import type { Logger } from 'pino'
import type { StudyRole } from '../shared/permissions.js'

/** What the session read found about its account: see Express.Request.account */
export interface AccountRead {
  /** the user id the session names (null when nobody is signed in on it) */
  userId: string | null
  /** that user's row, null when it no longer exists */
  user: { id: string; email: string; name: string; siteAdmin: boolean; disabled: boolean } | null
  /** the study id in the request's path (null when there is none) and the user's role in it */
  studyId: string | null
  role: StudyRole | null
}

declare global {
  namespace Express {
    interface User {
      id: string
      email: string
      name: string
      siteAdmin: boolean
    }
    interface Request {
      /** inputs parsed by middleware/validate.ts */
      valid: { body: any; query: any; params: any }
      /** the caller's role in the study of a study-scoped route (middleware/authorize.ts) */
      studyRole: StudyRole | null
      requestId: string
      log: Logger
      /**
       * The signed-in account and its membership of the study in the path, read with the session in
       * one statement at the start of this request (modules/auth/session.ts); never kept across requests.
       */
      account?: AccountRead
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    /** when the person signed in (ms since epoch): the absolute session limit counts from here */
    signedInAt: number
    csrfToken: string
  }
}
