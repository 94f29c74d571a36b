import { Router } from 'express'
import { auditQuery } from '../../../shared/schemas/audit.js'
import { idParams } from '../../../shared/schemas/common.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import type { AuditService } from './audit.service.js'

export function auditRouter({ authorize, audit }: { authorize: Authorize; audit: AuditService }) {
  const router = Router()
  router.get('/studies/:studyId/audit', authorize('study:audit.read'), validate({ params: idParams, query: auditQuery }), async (req, res) => {
    res.json(await audit.page(req.valid.params.studyId, req.valid.query))
  })
  router.get('/audit', authorize('site:audit.read'), validate({ query: auditQuery }), async (req, res) => {
    res.json(await audit.page(null, req.valid.query))
  })
  return router
}
