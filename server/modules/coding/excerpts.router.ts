import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { codeExcerptsQuery, codingSettings, excerptCreate, excerptDeleteQuery, excerptListQuery, excerptParams, excerptUpdate } from '../../../shared/schemas/coding.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ExcerptService } from './excerpt.service.js'

const transcriptParams = z.strictObject({ studyId: z.uuid(), transcriptId: z.uuid() })

/** Excerpts (each coder's own coding of a transcript) and the study's coding settings. */
export function excerptsRouter({ authorize, excerpts }: { authorize: Authorize; excerpts: ExcerptService }) {
  const router = Router()
  const onTranscript = '/studies/:studyId/transcripts/:transcriptId/excerpts'

  router.get(onTranscript, authorize('study:coding.read'), validate({ params: transcriptParams, query: excerptListQuery }), async (req, res) => {
    const { studyId, transcriptId } = req.valid.params
    res.json(await excerpts.list(studyId, transcriptId, req.user!, req.studyRole, req.valid.query.coderId))
  })
  router.post(onTranscript, authorize('study:coding.write'), validate({ params: transcriptParams, body: excerptCreate }), async (req, res) => {
    res.status(201).json(await excerpts.create(req.valid.params.studyId, req.valid.params.transcriptId, req.valid.body, req.user!))
  })
  router.get('/studies/:studyId/excerpts', authorize('study:coding.read'), validate({ params: idParams, query: codeExcerptsQuery }), async (req, res) => {
    res.json(await excerpts.listForCode(req.valid.params.studyId, req.valid.query.codeId))
  })
  router.patch('/studies/:studyId/excerpts/:excerptId', authorize('study:coding.write'), validate({ params: excerptParams, body: excerptUpdate }), async (req, res) => {
    res.json(await excerpts.update(req.valid.params.studyId, req.valid.params.excerptId, req.valid.body, req.user!))
  })
  router.delete('/studies/:studyId/excerpts/:excerptId', authorize('study:coding.write'), validate({ params: excerptParams, query: excerptDeleteQuery }), async (req, res) => {
    await excerpts.remove(req.valid.params.studyId, req.valid.params.excerptId, req.valid.query.version, req.user!)
    res.status(204).end()
  })
  router.get('/studies/:studyId/coding-settings', authorize('study:coding.read'), validate({ params: idParams }), async (req, res) => {
    res.json(await excerpts.settings(req.valid.params.studyId))
  })
  router.put('/studies/:studyId/coding-settings', authorize('study:coding.settings'), validate({ params: idParams, body: codingSettings }), async (req, res) => {
    res.json(await excerpts.setSettings(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  return router
}
