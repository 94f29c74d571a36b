import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { interviewGuideCreate, interviewOutcome, interviewReschedule, interviewSchedule } from '../../../shared/schemas/interviews.js'
import type { Authorize } from '../../middleware/authorize.js'
import { parseMetadata, requireFileType, safeFileName, singleFileUpload } from '../../middleware/upload.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import { sendDownload } from '../consent/download.js'
import type { InterviewGuideService } from './interview-guide.service.js'
import type { InterviewService } from './interview.service.js'

const interviewParams = z.strictObject({ studyId: z.uuid(), interviewId: z.uuid() })
const guideParams = z.strictObject({ studyId: z.uuid(), guideId: z.uuid() })
const listQuery = z.strictObject({ participantId: z.uuid().optional() })
const GUIDE_TYPES = ['application/pdf', 'application/vnd.openxmlformats-officedocument.wordprocessingml.document']

export function interviewsRouter({ authorize, interviews, guides }: { authorize: Authorize; interviews: InterviewService; guides: InterviewGuideService }) {
  const router = Router()

  router.get('/studies/:studyId/interview-guides', authorize('study:interviews.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ guides: await guides.list(req.valid.params.studyId) })
  })
  router.post('/studies/:studyId/interview-guides', authorize('study:interviewGuides.manage'), singleFileUpload(), validate({ params: idParams }), async (req, res) => {
    const input = parseMetadata(interviewGuideCreate, req.body?.metadata)
    const contentType = await requireFileType(req.file, GUIDE_TYPES)
    res.status(201).json(await guides.create(req.valid.params.studyId, input, { buffer: req.file!.buffer, name: safeFileName(req.file!.originalname), contentType }, actorOf(req)))
  })
  router.get('/studies/:studyId/interview-guides/:guideId/file', authorize('study:interviews.read'), validate({ params: guideParams }), async (req, res) => {
    sendDownload(res, await guides.file(req.valid.params.studyId, req.valid.params.guideId))
  })

  router.get('/studies/:studyId/interviews', authorize('study:interviews.read'), validate({ params: idParams, query: listQuery }), async (req, res) => {
    res.json({ interviews: await interviews.list(req.valid.params.studyId, req.valid.query.participantId) })
  })
  router.post('/studies/:studyId/interviews', authorize('study:interviews.manage'), validate({ params: idParams, body: interviewSchedule }), async (req, res) => {
    res.status(201).json(await interviews.schedule(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.get('/studies/:studyId/interviews/:interviewId', authorize('study:interviews.read'), validate({ params: interviewParams }), async (req, res) => {
    res.json(await interviews.get(req.valid.params.studyId, req.valid.params.interviewId))
  })
  router.patch('/studies/:studyId/interviews/:interviewId', authorize('study:interviews.manage'), validate({ params: interviewParams, body: interviewReschedule }), async (req, res) => {
    res.json(await interviews.reschedule(req.valid.params.studyId, req.valid.params.interviewId, req.valid.body, actorOf(req)))
  })
  router.post('/studies/:studyId/interviews/:interviewId/outcome', authorize('study:interviews.manage'), validate({ params: interviewParams, body: interviewOutcome }), async (req, res) => {
    res.json(await interviews.recordOutcome(req.valid.params.studyId, req.valid.params.interviewId, req.valid.body, actorOf(req)))
  })
  return router
}
