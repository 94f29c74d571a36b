import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { assignLead, studyCreate, studyUpdate } from '../../../shared/schemas/studies.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { StudyService } from './study.service.js'

export function studiesRouter({ authorize, studies }: { authorize: Authorize; studies: StudyService }) {
  const router = Router()

  router.get('/studies', authorize('signedIn'), async (req, res) => {
    res.json(await studies.list(req.user!))
  })

  router.post('/studies', authorize('site:studies.create'), validate({ body: studyCreate }), async (req, res) => {
    res.status(201).json(await studies.create(req.valid.body, actorOf(req)))
  })

  router.get('/studies/:studyId', authorize('study:study.read'), validate({ params: idParams }), async (req, res) => {
    res.json(await studies.get(req.valid.params.studyId))
  })

  router.patch('/studies/:studyId', authorize('study:study.update'), validate({ params: idParams, body: studyUpdate }), async (req, res) => {
    res.json(await studies.update(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })

  router.put('/studies/:studyId/lead', authorize('study:study.assignLead'), validate({ params: idParams, body: assignLead }), async (req, res) => {
    res.json(await studies.assignLead(req.valid.params.studyId, req.valid.body.email, actorOf(req)))
  })

  return router
}
