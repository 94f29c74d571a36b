import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { matrixQuery } from '../../../shared/schemas/coding.js'
import { sendCsv } from '../../lib/csv.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import type { CodeMatrixService } from './code-matrix.service.js'
import type { ExcerptService } from './excerpt.service.js'

/** The code matrices (codes × participants, co-occurrence), as JSON and CSV. */
export function codeMatricesRouter(deps: { authorize: Authorize; matrices: CodeMatrixService; excerpts: ExcerptService }) {
  const { authorize, matrices, excerpts } = deps
  const router = Router()
  const read = [authorize('study:coding.read'), validate({ params: idParams, query: matrixQuery })]

  router.get('/studies/:studyId/matrices/code-participant', ...read, async (req, res) => {
    await excerpts.assertMayView(req.valid.params.studyId, req.user!, req.studyRole, req.valid.query.coderId)
    res.json(await matrices.codeByParticipant(req.valid.params.studyId, req.valid.query.coderId))
  })
  router.get('/studies/:studyId/matrices/code-participant.csv', ...read, async (req, res) => {
    await excerpts.assertMayView(req.valid.params.studyId, req.user!, req.studyRole, req.valid.query.coderId)
    sendCsv(res, 'codes-by-participant.csv', await matrices.codeByParticipantCsv(req.valid.params.studyId, req.valid.query.coderId, req.valid.query.bom === '1'))
  })
  router.get('/studies/:studyId/matrices/co-occurrence', ...read, async (req, res) => {
    await excerpts.assertMayView(req.valid.params.studyId, req.user!, req.studyRole, req.valid.query.coderId)
    res.json(await matrices.coOccurrence(req.valid.params.studyId, req.valid.query.coderId))
  })
  router.get('/studies/:studyId/matrices/co-occurrence.csv', ...read, async (req, res) => {
    await excerpts.assertMayView(req.valid.params.studyId, req.user!, req.studyRole, req.valid.query.coderId)
    sendCsv(res, 'code-co-occurrence.csv', await matrices.coOccurrenceCsv(req.valid.params.studyId, req.valid.query.coderId, req.valid.query.bom === '1'))
  })
  return router
}
