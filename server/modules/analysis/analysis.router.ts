import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { agreementQuery, analysisSettings, saturationQuery } from '../../../shared/schemas/analysis.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ExcerptService } from '../coding/excerpt.service.js'
import type { AgreementService } from './agreement.service.js'
import type { SaturationService } from './saturation.service.js'

/** Analysis: the study's agreement settings, inter-coder agreement and saturation. */
export function analysisRouter(deps: { authorize: Authorize; agreement: AgreementService; saturation: SaturationService; excerpts: ExcerptService }) {
  const { authorize, agreement, saturation, excerpts } = deps
  const router = Router()
  router.get('/studies/:studyId/analysis-settings', authorize('study:saturation.read'), validate({ params: idParams }), async (req, res) => {
    res.json(await agreement.settings(req.valid.params.studyId))
  })
  router.put('/studies/:studyId/analysis-settings', authorize('study:analysis.settings'), validate({ params: idParams, body: analysisSettings }), async (req, res) => {
    res.json(await agreement.setSettings(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.get('/studies/:studyId/agreement', authorize('study:agreement.read'), validate({ params: idParams, query: agreementQuery }), async (req, res) => {
    res.json(await agreement.agreement(req.valid.params.studyId, req.studyRole, req.valid.query.coderIds))
  })
  router.get('/studies/:studyId/saturation', authorize('study:saturation.read'), validate({ params: idParams, query: saturationQuery }), async (req, res) => {
    const { coderId, ...params } = req.valid.query
    await excerpts.assertMayView(req.valid.params.studyId, req.user!, req.studyRole, coderId)
    res.json(await saturation.assess(req.valid.params.studyId, params, coderId))
  })
  return router
}
