import { PDFDocument } from 'pdf-lib'
import type { ConsentFormCreate } from '../../shared/schemas/consent.js'
import type { Client } from './test-app.js'

/** A small real PDF, made here (no fixture file needed). */
export async function makePdf(text = 'Consent form'): Promise<Buffer> {
  const pdf = await PDFDocument.create()
  pdf.addPage().drawText(text)
  return Buffer.from(await pdf.save())
}

export const FORM_V1: ConsentFormCreate = {
  label: 'v1.0',
  ethicsApprovalDate: '2026-02-02',
  effectiveDate: '2026-02-09',
  text: 'You are invited to take part in a research study. Taking part is your choice. You can stop at any time.',
  clauses: [
    { key: 'audio_recording', wording: 'The interview may be audio recorded.', requiredForParticipation: false },
    { key: 'direct_quotes', wording: 'Your words may be quoted, without your name.', requiredForParticipation: false },
    { key: 'future_contact', wording: 'We may contact you about future studies.', requiredForParticipation: false },
  ],
}

export async function uploadForm(lead: Client, studyId: string, form: ConsentFormCreate = FORM_V1, file?: { buffer: Buffer; name: string }) {
  const upload = file ?? { buffer: await makePdf(form.label), name: `consent-${form.label}.pdf` }
  return lead.agent
    .post(`/api/studies/${studyId}/consent-forms`)
    .set('X-CSRF-Token', lead.csrf)
    .field('metadata', JSON.stringify(form))
    .attach('file', upload.buffer, upload.name)
}

export async function approvedForm(lead: Client, studyId: string, form: ConsentFormCreate = FORM_V1) {
  const created = await uploadForm(lead, studyId, form)
  if (created.status !== 201) throw new Error(`upload: ${created.status} ${JSON.stringify(created.body)}`)
  const approved = await lead.post(`/api/studies/${studyId}/consent-forms/${created.body.id}/approve`)
  if (approved.status !== 200) throw new Error(`approve: ${approved.status} ${JSON.stringify(approved.body)}`)
  return approved.body
}
