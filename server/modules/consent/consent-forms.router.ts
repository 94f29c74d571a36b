import { Router } from 'express'
import { z } from 'zod'
import { idParams } from '../../../shared/schemas/common.js'
import { consentFormCreate, consentFormUpdate } from '../../../shared/schemas/consent.js'
import type { Authorize } from '../../middleware/authorize.js'
import { parseMetadata, requireFileType, safeFileName, singleFileUpload } from '../../middleware/upload.js'
import { validate } from '../../middleware/validate.js'
import { actorOf } from '../audit/audit.service.js'
import type { ConsentFormService } from './consent-form.service.js'
import { sendDownload } from './download.js'

const formParams = z.strictObject({ studyId: z.uuid(), formId: z.uuid() })
const FORM_TYPES = ['application/pdf', 'application/vnd.openxmlformats-officedocument.wordprocessingml.document']

export function consentFormsRouter({ authorize, forms }: { authorize: Authorize; forms: ConsentFormService }) {
  const router = Router()

  router.get('/studies/:studyId/consent-forms', authorize('study:consentForms.read'), validate({ params: idParams }), async (req, res) => {
    res.json({ forms: await forms.list(req.valid.params.studyId) })
  })

  router.post('/studies/:studyId/consent-forms', authorize('study:consentForms.manage'), singleFileUpload(), validate({ params: idParams }), async (req, res) => {
    const input = parseMetadata(consentFormCreate, req.body?.metadata)
    const contentType = await requireFileType(req.file, FORM_TYPES)
    const created = await forms.create(req.valid.params.studyId, input, { buffer: req.file!.buffer, name: safeFileName(req.file!.originalname), contentType }, actorOf(req))
    res.status(201).json(created)
  })

  router.patch('/studies/:studyId/consent-forms/:formId', authorize('study:consentForms.manage'), validate({ params: formParams, body: consentFormUpdate }), async (req, res) => {
    res.json(await forms.update(req.valid.params.studyId, req.valid.params.formId, req.valid.body, actorOf(req)))
  })

  router.post('/studies/:studyId/consent-forms/:formId/approve', authorize('study:consentForms.manage'), validate({ params: formParams }), async (req, res) => {
    res.json(await forms.approve(req.valid.params.studyId, req.valid.params.formId, actorOf(req)))
  })

  router.get('/studies/:studyId/consent-forms/:formId/file', authorize('study:consentForms.read'), validate({ params: formParams }), async (req, res) => {
    sendDownload(res, await forms.file(req.valid.params.studyId, req.valid.params.formId))
  })

  return router
}
