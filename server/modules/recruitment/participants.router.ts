import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { overrideRequest, participantListQuery, rescreenRequest, staffEnquiry } from '../../../shared/schemas/recruitment.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ParticipantService } from './participant.service.js'

const participantParams = z.strictObject({ studyId: z.uuid(), participantId: z.uuid() })

export function participantsRouter({ authorize, participants }: { authorize: Authorize; participants: ParticipantService }) {
  const router = Router()

  // coders get pseudonyms and characteristics only; contact columns are added for lead and coordinators
  router.get('/studies/:studyId/participants', authorize('study:participants.list'), validate({ params: idParams, query: participantListQuery }), async (req, res) => {
    res.json(await participants.list(req.valid.params.studyId, req.valid.query, req.studyRole))
  })

  router.post('/studies/:studyId/participants', authorize('study:participants.screen'), validate({ params: idParams, body: staffEnquiry }), async (req, res) => {
    res.status(201).json(await participants.createByStaff(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })

  router.get('/studies/:studyId/participants/:participantId', authorize('study:participants.read'), validate({ params: participantParams }), async (req, res) => {
    res.json(await participants.detail(req.valid.params.studyId, req.valid.params.participantId))
  })

  router.post(
    '/studies/:studyId/participants/:participantId/screenings',
    authorize('study:participants.screen'),
    validate({ params: participantParams, body: rescreenRequest }),
    async (req, res) => {
      const { studyId, participantId } = req.valid.params
      res.status(201).json(await participants.rescreen(studyId, participantId, req.valid.body.answers, req.valid.body.note, actorOf(req)))
    },
  )

  router.post(
    '/studies/:studyId/participants/:participantId/override',
    authorize('study:participants.override'),
    validate({ params: participantParams, body: overrideRequest }),
    async (req, res) => {
      const { studyId, participantId } = req.valid.params
      res.json(await participants.override(studyId, participantId, req.valid.body, actorOf(req)))
    },
  )

  return router
}
