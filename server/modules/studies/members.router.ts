import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { memberParams, memberUpdate } from '../../../shared/schemas/studies.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { MemberService } from './member.service.js'

export function membersRouter({ authorize, members }: { authorize: Authorize; members: MemberService }) {
  const router = Router()

  router.get('/studies/:studyId/members', authorize('study:members.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ members: await members.list(req.valid.params.studyId) })
  })

  router.patch(
    '/studies/:studyId/members/:memberId',
    authorize('study:members.manage'),
    validate({ params: memberParams, body: memberUpdate }),
    async (req, res) => {
      const { studyId, memberId } = req.valid.params
      res.json(await members.changeRole(studyId, memberId, req.valid.body.role, actorOf(req)))
    },
  )

  router.delete('/studies/:studyId/members/:memberId', authorize('study:members.manage'), validate({ params: memberParams }), async (req, res) => {
    await members.remove(req.valid.params.studyId, req.valid.params.memberId, actorOf(req))
    res.status(204).end()
  })

  return router
}
