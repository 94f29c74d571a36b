import { Router } from 'express'
import { userCreate, userParams, userUpdate } from '../../../shared/schemas/users.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { UserService } from './user.service.js'

export function usersRouter({ authorize, users }: { authorize: Authorize; users: UserService }) {
  const router = Router()
  router.get('/users', authorize('site:users.manage'), async (_req, res) => {
    res.json({ users: await users.list() })
  })
  router.post('/users', authorize('site:users.manage'), validate({ body: userCreate }), async (req, res) => {
    res.status(201).json(await users.create(req.valid.body, actorOf(req)))
  })
  router.patch('/users/:userId', authorize('site:users.manage'), validate({ params: userParams, body: userUpdate }), async (req, res) => {
    res.json(await users.setDisabled(req.valid.params.userId, req.valid.body.disabled, actorOf(req)))
  })
  return router
}
