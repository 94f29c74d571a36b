import { Router } from 'express'
import { publicConsentSubmit, publicWithdrawalSubmit } from '../../../shared/schemas/consent.js'
import { tokenParams } from '../../../shared/schemas/auth.js'
import type { Authorize } from '../../middleware/authorize.js'
import { validate } from '../../middleware/validate.js'
import type { ConsentService } from './consent.service.js'
import { sendDownload } from './download.js'
import type { WithdrawalService } from './withdrawal.service.js'

/** The e-consent and withdrawal pages' API for participants, who have no account: the token is the key. */
export function publicConsentRouter({ authorize, consent, withdrawals }: { authorize: Authorize; consent: ConsentService; withdrawals: WithdrawalService }) {
  const router = Router()

  router.get('/public/consent/:token', authorize('public'), validate({ params: tokenParams }), async (req, res) => {
    res.json(await consent.publicPage(req.valid.params.token))
  })
  router.get('/public/consent/:token/file', authorize('public'), validate({ params: tokenParams }), async (req, res) => {
    sendDownload(res, await consent.publicFile(req.valid.params.token))
  })
  router.post('/public/consent/:token', authorize('public'), validate({ params: tokenParams, body: publicConsentSubmit }), async (req, res) => {
    const result = await consent.publicSign(req.valid.params.token, req.valid.body, { ip: req.ip ?? '', userAgent: req.get('user-agent') ?? '' })
    res.status(201).json(result)
  })

  router.get('/public/withdrawal/:token', authorize('public'), validate({ params: tokenParams }), async (req, res) => {
    res.json(await withdrawals.publicPage(req.valid.params.token))
  })
  router.post('/public/withdrawal/:token', authorize('public'), validate({ params: tokenParams, body: publicWithdrawalSubmit }), async (req, res) => {
    await withdrawals.publicRequest(req.valid.params.token, req.valid.body)
    res.status(202).json({ detail: 'Thank you. The study team has your request and will confirm by e-mail.' })
  })

  return router
}
