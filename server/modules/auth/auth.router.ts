import { Router, type Request } from 'express'
import { loginRequest, passwordChangeRequest, passwordResetConfirm, passwordResetRequest } from '../../../shared/schemas/auth.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf, type AuditService } from '../audit/audit.service.js'
import type { AuthService } from './auth.service.js'
import type { SessionRevoker } from './session-store.js'

export interface CsrfTools {
  generateToken(req: Request, overwrite?: boolean): string
}

function logIn(req: Request, user: Express.User): Promise<void> {
  return new Promise((resolve, reject) => req.login(user, (error) => (error ? reject(error) : resolve())))
}

export function authRouter(deps: { authorize: Authorize; auth: AuthService; audit: AuditService; sessions: SessionRevoker; csrf: CsrfTools }) {
  const { authorize, auth, audit, sessions, csrf } = deps
  const router = Router()

  router.get('/auth/csrf', authorize('public'), (req, res) => {
    res.json({ token: csrf.generateToken(req) })
  })

  router.post('/auth/login', authorize('public'), validate({ body: loginRequest }), async (req, res) => {
    const { email, password } = req.valid.body
    const user = await auth.verifyCredentials(email, password, actorOf(req, email))
    // passport 0.7 regenerates the session here (no fixation); the CSRF token is issued anew after it.
    await logIn(req, { id: user.id, email: user.email, name: user.name, siteAdmin: user.siteAdmin })
    req.session.signedInAt = Date.now()
    res.setHeader('X-CSRF-Token', csrf.generateToken(req, true))
    res.json(await auth.me(user.id))
  })

  router.post('/auth/logout', authorize('signedIn'), async (req, res) => {
    const actor = actorOf(req)
    await audit.record(actor, { action: 'auth.signed_out', targetType: 'user', targetId: actor.id })
    await new Promise<void>((resolve, reject) => req.logout((error) => (error ? reject(error) : resolve())))
    await new Promise<void>((resolve) => req.session.destroy(() => resolve()))
    res.status(204).end()
  })

  router.get('/auth/me', authorize('signedIn'), async (req, res) => {
    res.json(await auth.me(req.user!.id))
  })

  router.post('/auth/password-reset', authorize('public'), validate({ body: passwordResetRequest }), async (req, res) => {
    await auth.requestPasswordReset(req.valid.body.email, actorOf(req, req.valid.body.email))
    res.status(202).json({ detail: 'If an account uses this e-mail address, a link to choose a new password is on its way.' })
  })

  router.post('/auth/password-reset/confirm', authorize('public'), validate({ body: passwordResetConfirm }), async (req, res) => {
    await auth.confirmPasswordReset(req.valid.body, actorOf(req))
    res.status(204).end()
  })

  router.post('/auth/password', authorize('signedIn'), validate({ body: passwordChangeRequest }), async (req, res) => {
    await auth.changePassword(req.user!.id, req.sessionID, req.valid.body, actorOf(req))
    res.status(204).end()
  })

  router.post('/auth/sessions/revoke-others', authorize('signedIn'), async (req, res) => {
    const ended = await sessions.revokeAll(req.user!.id, req.sessionID)
    await audit.record(actorOf(req), { action: 'auth.other_sessions_ended', targetType: 'user', targetId: req.user!.id, details: { ended } })
    res.status(204).end()
  })

  return router
}
