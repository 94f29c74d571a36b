import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { codeCreate, codeMerge, codeMove, codeParams, codeSplit, codeUpdate, codebookImport, snapshotCreate, snapshotParams } from '../../../shared/schemas/coding.js'
import { sendCsv } from '../../lib/csv.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { CodeStructureService } from './code-structure.service.js'
import type { CodeService } from './code.service.js'
import type { CodebookTransferService } from './codebook-transfer.service.js'

const bomQuery = z.strictObject({ bom: z.enum(['0', '1']).optional() })

/** The codebook: codes, their structure, CSV in and out, snapshots. */
export function codesRouter(deps: { authorize: Authorize; codes: CodeService; structure: CodeStructureService; transfer: CodebookTransferService }) {
  const { authorize, codes, structure, transfer } = deps
  const router = Router()
  const one = '/studies/:studyId/codes/:codeId'

  router.get('/studies/:studyId/codes', authorize('study:codebook.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ codes: await codes.list(req.valid.params.studyId) })
  })
  router.post('/studies/:studyId/codes', authorize('study:codebook.manage'), validate({ params: idParams, body: codeCreate }), async (req, res) => {
    res.status(201).json(await codes.create(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.patch(one, authorize('study:codebook.manage'), validate({ params: codeParams, body: codeUpdate }), async (req, res) => {
    res.json(await codes.update(req.valid.params.studyId, req.valid.params.codeId, req.valid.body, actorOf(req)))
  })
  router.put(`${one}/position`, authorize('study:codebook.manage'), validate({ params: codeParams, body: codeMove }), async (req, res) => {
    res.json({ codes: await structure.move(req.valid.params.studyId, req.valid.params.codeId, req.valid.body, actorOf(req)) })
  })
  router.post(`${one}/merge`, authorize('study:codebook.manage'), validate({ params: codeParams, body: codeMerge }), async (req, res) => {
    res.json({ codes: await structure.merge(req.valid.params.studyId, req.valid.params.codeId, req.valid.body, actorOf(req)) })
  })
  router.post(`${one}/split`, authorize('study:codebook.manage'), validate({ params: codeParams, body: codeSplit }), async (req, res) => {
    res.json({ codes: await structure.split(req.valid.params.studyId, req.valid.params.codeId, req.valid.body, actorOf(req)) })
  })
  router.get('/studies/:studyId/codebook.csv', authorize('study:codebook.read'), validate({ params: idParams, query: bomQuery }), async (req, res) => {
    sendCsv(res, 'codebook.csv', await transfer.csv(req.valid.params.studyId, req.valid.query.bom === '1'))
  })
  router.post('/studies/:studyId/codebook/import', authorize('study:codebook.manage'), validate({ params: idParams, body: codebookImport }), async (req, res) => {
    res.json(await transfer.import(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.get('/studies/:studyId/codebook/snapshots', authorize('study:codebook.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ snapshots: await transfer.snapshots(req.valid.params.studyId) })
  })
  router.post('/studies/:studyId/codebook/snapshots', authorize('study:codebook.manage'), validate({ params: idParams, body: snapshotCreate }), async (req, res) => {
    res.status(201).json(await transfer.saveSnapshot(req.valid.params.studyId, req.valid.body.name, actorOf(req)))
  })
  router.get('/studies/:studyId/codebook/snapshots/:snapshotId', authorize('study:codebook.read'), validate({ params: snapshotParams }), async (req, res) => {
    res.json(await transfer.snapshot(req.valid.params.studyId, req.valid.params.snapshotId))
  })
  return router
}
