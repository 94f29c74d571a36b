import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { memoCreate, memoListQuery, memoParams, memoUpdate } from '../../../shared/schemas/coding.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import type { MemoService } from './memo.service.js'

/** Memos on the study, transcripts, excerpts and codes. */
export function memosRouter({ authorize, memos }: { authorize: Authorize; memos: MemoService }) {
  const router = Router()
  router.get('/studies/:studyId/memos', authorize('study:memos.read'), validate({ params: idParams, query: memoListQuery }), async (req, res) => {
    res.json({ memos: await memos.list(req.valid.params.studyId, req.valid.query) })
  })
  router.post('/studies/:studyId/memos', authorize('study:memos.write'), validate({ params: idParams, body: memoCreate }), async (req, res) => {
    res.status(201).json(await memos.create(req.valid.params.studyId, req.valid.body, req.user!))
  })
  router.patch('/studies/:studyId/memos/:memoId', authorize('study:memos.write'), validate({ params: memoParams, body: memoUpdate }), async (req, res) => {
    res.json(await memos.update(req.valid.params.studyId, req.valid.params.memoId, req.valid.body, req.user!))
  })
  router.delete('/studies/:studyId/memos/:memoId', authorize('study:memos.write'), validate({ params: memoParams }), async (req, res) => {
    await memos.remove(req.valid.params.studyId, req.valid.params.memoId, req.user!)
    res.status(204).end()
  })
  return router
}
