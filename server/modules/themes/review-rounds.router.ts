import { Router } from 'express'
import { idParams } from '../../../shared/schemas/common.js'
import { answerParams, answerResponse, partnerAnswerInput, partnerThemeParams, roundCreate, roundParams } from '../../../shared/schemas/themes.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { PartnerReviewService } from './partner-review.service.js'
import type { ReviewRoundService } from './review-round.service.js'

/** Review rounds: the lead's side under /review-rounds, the patient partner's under /partner/rounds. */
export function reviewRoundsRouter({ authorize, rounds, partner }: { authorize: Authorize; rounds: ReviewRoundService; partner: PartnerReviewService }) {
  const router = Router()
  router.get('/studies/:studyId/review-rounds', authorize('study:reviewRounds.manage'), validate({ params: idParams }), async (req, res) => {
    res.json({ rounds: await rounds.list(req.valid.params.studyId) })
  })
  router.post('/studies/:studyId/review-rounds', authorize('study:reviewRounds.manage'), validate({ params: idParams, body: roundCreate }), async (req, res) => {
    res.status(201).json(await rounds.create(req.valid.params.studyId, req.valid.body, actorOf(req)))
  })
  router.get('/studies/:studyId/review-rounds/:roundId', authorize('study:reviewRounds.manage'), validate({ params: roundParams }), async (req, res) => {
    res.json(await rounds.detail(req.valid.params.studyId, req.valid.params.roundId))
  })
  router.post('/studies/:studyId/review-rounds/:roundId/close', authorize('study:reviewRounds.manage'), validate({ params: roundParams }), async (req, res) => {
    res.json(await rounds.close(req.valid.params.studyId, req.valid.params.roundId, actorOf(req)))
  })
  router.put('/studies/:studyId/review-rounds/:roundId/answers/:answerId/response', authorize('study:reviewRounds.manage'), validate({ params: answerParams, body: answerResponse }), async (req, res) => {
    const { studyId, roundId, answerId } = req.valid.params
    res.json(await rounds.respond(studyId, roundId, answerId, req.valid.body.response, actorOf(req)))
  })
  router.get('/studies/:studyId/partner/rounds', authorize('study:review.answer'), validate({ params: idParams }), async (req, res) => {
    res.json({ rounds: await partner.rounds(req.valid.params.studyId, req.user!.id) })
  })
  router.get('/studies/:studyId/partner/rounds/:roundId', authorize('study:review.answer'), validate({ params: roundParams }), async (req, res) => {
    res.json(await partner.round(req.valid.params.studyId, req.valid.params.roundId, req.user!.id))
  })
  router.put('/studies/:studyId/partner/rounds/:roundId/themes/:themeId', authorize('study:review.answer'), validate({ params: partnerThemeParams, body: partnerAnswerInput }), async (req, res) => {
    const { studyId, roundId, themeId } = req.valid.params
    res.json(await partner.answer(studyId, roundId, themeId, req.user!.id, req.valid.body))
  })
  return router
}
