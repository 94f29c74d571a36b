import type { NextFunction, Request, RequestHandler, Response } from 'express'
import type { DataSource } from 'typeorm'
import { decide, type Access, type StudyRole } from '../../shared/permissions.js'
import { ForbiddenError, UnauthenticatedError } from '../lib/errors.js'

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export type Guard = RequestHandler & { access: Access }

/**
 * The one guard: every route declares what it needs (shared/permissions.ts) and this middleware
 * decides. The caller's study role is read from the database on every request (with the session when
 * the study is in the path, auth/session.ts), so a removed member loses access at once (ASVS 8.3.2).
 */
export function createAuthorize(dataSource: DataSource) {
  return function authorize(access: Access): Guard {
    const guard = async (req: Request, _res: Response, next: NextFunction) => {
      req.studyRole = null
      const user = req.user
      let role: StudyRole | null = null
      if (user && access.startsWith('study:')) {
        const studyId = String(req.params.studyId ?? '')
        const read = req.account
        if (read && read.userId === user.id && read.studyId !== null && read.studyId === studyId) {
          // read with the session at the start of this request, in the same statement (auth/session.ts)
          role = read.role
        } else if (UUID.test(studyId)) {
          // else one plain query
          const [membership]: { role: StudyRole }[] = await dataSource.query('SELECT role FROM memberships WHERE study_id = $1 AND user_id = $2', [studyId, user.id])
          role = membership?.role ?? null
        }
      }
      const decision = decide({ signedIn: Boolean(user), siteAdmin: Boolean(user?.siteAdmin), role }, access)
      if (decision === 'unauthenticated') return next(new UnauthenticatedError())
      if (decision === 'forbidden') {
        req.log?.info({ userId: user?.id, access, path: req.originalUrl }, 'authorization denied')
        return next(new ForbiddenError())
      }
      req.studyRole = role
      next()
    }
    return Object.assign(guard, { access })
  }
}
export type Authorize = ReturnType<typeof createAuthorize>
