import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { staffConsentInput, withdrawalInput } from '../../../shared/schemas/consent.js'
import type { Authorize } from '../../middleware/authorize.js'
import { parseMetadata, requireFileType, safeFileName, singleFileUpload } from '../../middleware/upload.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ConsentSummaryService } from './consent-summary.service.js'
import type { ConsentService } from './consent.service.js'
import { sendDownload } from './download.js'
import type { WithdrawalService } from './withdrawal.service.js'

const participantParams = z.strictObject({ studyId: z.uuid(), participantId: z.uuid() })
const receiptParams = participantParams.extend({ consentId: z.uuid() }).strict()
const linkBody = z.strictObject({ formId: z.uuid().optional() })
const SIGNED_TYPES = ['application/pdf', 'image/png', 'image/jpeg']

export function consentRouter(deps: { authorize: Authorize; consent: ConsentService; withdrawals: WithdrawalService; summaries: ConsentSummaryService }) {
  const { authorize, consent, withdrawals, summaries } = deps
  const router = Router()
  const base = '/studies/:studyId/participants/:participantId'

  router.get(`${base}/consent`, authorize('study:consent.read'), validate({ params: participantParams }), async (req, res) => {
    res.json(await consent.view(req.valid.params.studyId, req.valid.params.participantId))
  })

  router.post(`${base}/consents`, authorize('study:consent.record'), validate({ params: participantParams, body: staffConsentInput }), async (req, res) => {
    const { studyId, participantId } = req.valid.params
    res.status(201).json(await consent.recordByStaff(studyId, participantId, req.valid.body, null, actorOf(req)))
  })

  router.post(`${base}/consents/written`, authorize('study:consent.record'), singleFileUpload(), validate({ params: participantParams }), async (req, res) => {
    const { studyId, participantId } = req.valid.params
    const input = parseMetadata(staffConsentInput, req.body?.metadata)
    const contentType = await requireFileType(req.file, SIGNED_TYPES)
    const file = { buffer: req.file!.buffer, name: safeFileName(req.file!.originalname), contentType }
    res.status(201).json(await consent.recordByStaff(studyId, participantId, input, file, actorOf(req)))
  })

  router.post(`${base}/consent-links`, authorize('study:consent.record'), validate({ params: participantParams, body: linkBody }), async (req, res) => {
    const { studyId, participantId } = req.valid.params
    res.status(201).json(await consent.sendLink(studyId, participantId, req.valid.body.formId, actorOf(req)))
  })

  router.get(`${base}/consents/:consentId/receipt.pdf`, authorize('study:consent.read'), validate({ params: receiptParams }), async (req, res) => {
    const { studyId, participantId, consentId } = req.valid.params
    sendDownload(res, { name: `consent-receipt-${consentId.slice(0, 8)}.pdf`, contentType: 'application/pdf', body: await consent.receipt(studyId, participantId, consentId) })
  })

  router.post(`${base}/withdrawal`, authorize('study:withdrawal.record'), validate({ params: participantParams, body: withdrawalInput }), async (req, res) => {
    const { studyId, participantId } = req.valid.params
    await withdrawals.record(studyId, participantId, req.valid.body, actorOf(req))
    res.status(201).json(await consent.view(studyId, participantId))
  })

  router.get('/studies/:studyId/consent/summary', authorize('study:consent.summary'), validate({ params: idParams }), async (req, res) => {
    res.json(await summaries.summary(req.valid.params.studyId))
  })

  return router
}
