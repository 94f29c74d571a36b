import { Router, type Request } from 'express'
import { invitationAccept, tokenParams } from '../../../shared/schemas/auth.js'
import { idParams } from '../../../shared/schemas/common.js'
import { invitationCreate, invitationParams } from '../../../shared/schemas/studies.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { AuthService } from '../auth/auth.service.js'
import type { CsrfTools } from '../auth/auth.router.js'
import type { InvitationService } from './invitation.service.js'

export function invitationsRouter(deps: { authorize: Authorize; invitations: InvitationService; auth: AuthService; csrf: CsrfTools }) {
  const { authorize, invitations, auth, csrf } = deps
  const router = Router()

  router.get('/studies/:studyId/invitations', authorize('study:invitations.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ invitations: await invitations.list(req.valid.params.studyId) })
  })

  router.post('/studies/:studyId/invitations', authorize('study:invitations.manage'), validate({ params: idParams, body: invitationCreate }), async (req, res) => {
    res.status(201).json(await invitations.create(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })

  router.delete(
    '/studies/:studyId/invitations/:invitationId',
    authorize('study:invitations.manage'),
    validate({ params: invitationParams }),
    async (req, res) => {
      await invitations.revoke(req.valid.params.studyId, req.valid.params.invitationId, actorOf(req))
      res.status(204).end()
    },
  )

  // The invitee has no session yet: these two are public and protected by the single-use token.
  router.get('/invitations/:token', authorize('public'), validate({ params: tokenParams }), async (req, res) => {
    res.json(await invitations.preview(req.valid.params.token))
  })

  router.post('/invitations/:token/accept', authorize('public'), validate({ params: tokenParams, body: invitationAccept }), async (req, res) => {
    const { user, studyId } = await invitations.accept(req.valid.params.token, req.valid.body, actorOf(req))
    await new Promise<void>((resolve, reject) =>
      (req as Request).login({ id: user.id, email: user.email, name: user.name, siteAdmin: user.siteAdmin }, (e) => (e ? reject(e) : resolve())),
    )
    req.session.signedInAt = Date.now()
    res.setHeader('X-CSRF-Token', csrf.generateToken(req, true))
    res.json({ ...(await auth.me(user.id)), studyId })
  })

  return router
}
