import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { deidentificationTerms, flagDecisions } from '../../../shared/schemas/interviews.js'
import type { Authorize } from '../../middleware/authorize.js'
import { singleFileUpload } from '../../middleware/upload.js'
import { validate } from '../../middleware/validate.js'
import { ValidationError } from '../../lib/errors.js'
import { actorOf } from '../audit/audit.service.js'
import type { TranscriptService } from './transcript.service.js'

const transcriptParams = z.strictObject({ studyId: z.uuid(), transcriptId: z.uuid() })
const interviewParams = z.strictObject({ studyId: z.uuid(), interviewId: z.uuid() })

export function transcriptsRouter({ authorize, transcripts }: { authorize: Authorize; transcripts: TranscriptService }) {
  const router = Router()
  const one = '/studies/:studyId/transcripts/:transcriptId'

  router.get('/studies/:studyId/transcripts', authorize('study:transcripts.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ transcripts: await transcripts.list(req.valid.params.studyId, req.studyRole) })
  })
  // the file arrives as multipart (20 MB limit) and is parsed from memory, never written to disk
  router.post('/studies/:studyId/interviews/:interviewId/transcripts', authorize('study:transcripts.upload'), singleFileUpload(), validate({ params: interviewParams }), async (req, res) => {
    if (!req.file) throw new ValidationError('Choose a transcript file to upload.', [{ path: 'file', message: 'Choose a file.' }])
    res.status(201).json(await transcripts.upload(req.valid.params.studyId, req.valid.params.interviewId, req.file.buffer, actorOf(req)))
  })
  router.get(one, authorize('study:transcripts.read'), validate({ params: transcriptParams }), async (req, res) => {
    res.json(await transcripts.read(req.valid.params.studyId, req.valid.params.transcriptId))
  })
  router.get(`${one}/deidentification`, authorize('study:transcripts.upload'), validate({ params: transcriptParams }), async (req, res) => {
    res.json(await transcripts.review(req.valid.params.studyId, req.valid.params.transcriptId))
  })
  router.put(`${one}/deidentification`, authorize('study:transcripts.upload'), validate({ params: transcriptParams, body: flagDecisions }), async (req, res) => {
    res.json(await transcripts.decide(req.valid.params.studyId, req.valid.params.transcriptId, req.valid.body, actorOf(req)))
  })
  router.post(`${one}/approve`, authorize('study:transcripts.approve'), validate({ params: transcriptParams }), async (req, res) => {
    res.json(await transcripts.approve(req.valid.params.studyId, req.valid.params.transcriptId, actorOf(req)))
  })
  router.post(`${one}/reject`, authorize('study:transcripts.approve'), validate({ params: transcriptParams }), async (req, res) => {
    res.json(await transcripts.reject(req.valid.params.studyId, req.valid.params.transcriptId, actorOf(req)))
  })
  router.get('/studies/:studyId/deidentification-terms', authorize('study:anonymisationLog.read'), validate({ params: idParams }), async (req, res) => {
    res.json(await transcripts.terms(req.valid.params.studyId))
  })
  router.put('/studies/:studyId/deidentification-terms', authorize('study:transcripts.upload'), validate({ params: idParams, body: deidentificationTerms }), async (req, res) => {
    res.json(await transcripts.setTerms(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.get('/studies/:studyId/anonymisation-log', authorize('study:anonymisationLog.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ entries: await transcripts.anonymisationLog(req.valid.params.studyId) })
  })
  return router
}
