import 'express-session'
import type { Logger } from 'pino'
import type { StudyRole } from '../shared/permissions.js'

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
