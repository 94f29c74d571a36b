import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { questionnaireInput, recruitmentSettingsUpdate } from '../../../shared/schemas/recruitment.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { QuestionnaireService } from './questionnaire.service.js'
import type { RecruitmentSettingsService } from './recruitment-settings.service.js'
import type { RecruitmentSummaryService } from './recruitment-summary.service.js'

export function recruitmentRouter(deps: {
  authorize: Authorize
  settings: RecruitmentSettingsService
  questionnaires: QuestionnaireService
  summaries: RecruitmentSummaryService
}) {
  const { authorize, settings, questionnaires, summaries } = deps
  const router = Router()

  router.get('/studies/:studyId/recruitment-settings', authorize('study:recruitment.summary'), validate({ params: idParams }), async (req, res) => {
    res.json(await settings.get(req.valid.params.studyId))
  })
  router.patch(
    '/studies/:studyId/recruitment-settings',
    authorize('study:recruitment.settings'),
    validate({ params: idParams, body: recruitmentSettingsUpdate }),
    async (req, res) => {
      res.json(await settings.update(req.valid.params.studyId, req.valid.body, actorOf(req)))
    },
  )

  router.get('/studies/:studyId/screening-form', authorize('study:screeningForm.read'), validate({ params: idParams }), async (req, res) => {
    res.json(await questionnaires.current(req.valid.params.studyId))
  })
  router.get('/studies/:studyId/screening-form/versions', authorize('study:screeningForm.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ versions: await questionnaires.versions(req.valid.params.studyId) })
  })
  router.put(
    '/studies/:studyId/screening-form',
    authorize('study:screeningForm.manage'),
    validate({ params: idParams, body: questionnaireInput }),
    async (req, res) => {
      res.json(await questionnaires.save(req.valid.params.studyId, req.valid.body, actorOf(req)))
    },
  )

  router.get('/studies/:studyId/recruitment/summary', authorize('study:recruitment.summary'), validate({ params: idParams }), async (req, res) => {
    res.json(await summaries.summary(req.valid.params.studyId))
  })

  return router
}
