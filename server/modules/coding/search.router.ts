import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { searchQuery } from '../../../shared/schemas/coding.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import type { CodingSearchService } from './coding-search.service.js'
import type { ExcerptService } from './excerpt.service.js'

/** Full-text search across excerpts and approved transcripts. */
export function searchRouter({ authorize, search, excerpts }: { authorize: Authorize; search: CodingSearchService; excerpts: ExcerptService }) {
  const router = Router()
  router.get('/studies/:studyId/search', authorize('study:coding.read'), validate({ params: idParams, query: searchQuery }), async (req, res) => {
    if (req.valid.query.coderId) await excerpts.assertMayView(req.valid.params.studyId, req.user!, req.studyRole, req.valid.query.coderId)
    res.json(await search.search(req.valid.params.studyId, req.valid.query, req.user!, req.studyRole))
  })
  return router
}
