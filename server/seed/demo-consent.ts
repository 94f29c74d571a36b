import { randomUUID } from 'node:crypto'
import { PDFDocument, StandardFonts } from 'pdf-lib'
import { In, type EntityManager } from 'typeorm'
import type { ConsentClause } from '../../shared/schemas/consent.js'
import { newToken } from '../lib/tokens.js'
import { ConsentForm } from '../modules/consent/consent-form.entity.js'
import { documentHash } from '../modules/consent/consent-form.service.js'
import { ConsentLink } from '../modules/consent/consent-link.entity.js'
import { ConsentRecord } from '../modules/consent/consent-record.entity.js'
import { meaningFor } from '../modules/consent/consent-views.js'
import { Withdrawal } from '../modules/consent/withdrawal.entity.js'
import { ParticipantContact } from '../modules/recruitment/participant-contact.entity.js'
import { ParticipantEvent } from '../modules/recruitment/participant-event.entity.js'
import { Participant } from '../modules/recruitment/participant.entity.js'
import type { Study } from '../modules/studies/study.entity.js'
import type { ObjectStore } from '../storage/object-store.js'

const CLAUSES: ConsentClause[] = [
  { key: 'audio_recording', wording: 'The interview may be audio recorded so that it can be typed up.', requiredForParticipation: false },
  { key: 'direct_quotes', wording: 'Your words may be quoted in reports, without your name.', requiredForParticipation: false },
  { key: 'future_contact', wording: 'We may contact you about future studies.', requiredForParticipation: false },
]

const TEXT_V1 = [
  'You are invited to take part in a research study about coming home from hospital after a stroke.',
  'We want to learn what family members wish they had known. You will talk with a researcher for about an hour.',
  'Taking part is your choice. You can stop at any time, and you do not have to give a reason.',
  'We will keep your name and contact details apart from what you tell us. Only the study team will see them.',
  'If you have questions, contact the study team. If you have concerns about the study, contact the ethics board.',
].join('\n')
const TEXT_V2 = `${TEXT_V1}\nNew in this version: we may share the de-identified interview text with other researchers after the study, if you agree.`

async function formPdf(title: string, text: string): Promise<Buffer> {
  const pdf = await PDFDocument.create()
  const font = await pdf.embedFont(StandardFonts.Helvetica)
  const page = pdf.addPage([595, 842])
  page.drawText(title, { x: 50, y: 790, size: 16, font })
  text.split('\n').forEach((line, i) => page.drawText(line.slice(0, 95), { x: 50, y: 750 - i * 20, size: 9, font }))
  return Buffer.from(await pdf.save())
}

/**
 * Two consent form versions (v1 superseded, v2 approved), participants consented on each, one left on
 * v1 (the re-consent queue), one link waiting, and one withdrawal with data removed. Invented.
 */
export async function seedDemoConsent(manager: EntityManager, study: Study, storage: ObjectStore, lead: { id: string; name: string }, coordinator: { id: string; name: string }) {
  const forms: ConsentForm[] = []
  for (const [label, text, approved, status] of [
    ['v1.0', TEXT_V1, '2026-02-02', 'superseded'],
    ['v2.0', TEXT_V2, '2026-09-14', 'approved'],
  ] as const) {
    const id = randomUUID()
    const key = `studies/${study.id}/consent-forms/${id}`
    const stored = await storage.put(key, await formPdf(`Coming Home After Stroke - consent form ${label}`, text), 'application/pdf')
    forms.push(
      await manager.save(
        manager.create(ConsentForm, {
          id,
          studyId: study.id,
          label,
          status,
          ethicsApprovalDate: approved,
          effectiveDate: approved,
          clauses: CLAUSES,
          text,
          fileKey: key,
          fileName: `consent-form-${label}.pdf`,
          fileContentType: 'application/pdf',
          fileSize: stored.size,
          fileSha256: stored.sha256,
          documentSha256: documentHash(stored.sha256, text),
          checklist: { research_and_purpose: true, voluntary_participation: true, contacts: true },
          approvedAt: new Date(`${approved}T15:00:00Z`),
          createdAt: new Date(`${approved}T09:00:00Z`),
          approvedById: lead.id,
          createdById: lead.id,
        }),
      ),
    )
  }
  const [v1, v2] = forms as [ConsentForm, ConsentForm]
  const byPseudonym = new Map((await manager.findBy(Participant, { studyId: study.id })).map((p) => [p.pseudonym, p]))
  const names = new Map((await manager.findBy(ParticipantContact, { participantId: In([...byPseudonym.values()].map((p) => p.id)) })).map((c) => [c.participantId, c.name]))
  const yes = { audio_recording: true, direct_quotes: true, future_contact: true }
  const plan: [string, ConsentForm, 'electronic' | 'verbal', Record<string, boolean>, number][] = [
    ['P01', v1, 'electronic', yes, 50], // still on v1: the re-consent queue
    ['P02', v2, 'verbal', yes, 40],
    ['P03', v2, 'electronic', { ...yes, future_contact: false }, 35],
    ['P06', v2, 'electronic', { ...yes, direct_quotes: false }, 30],
    ['P08', v1, 'verbal', yes, 28], // withdraws with data removed
    ['P14', v2, 'electronic', yes, 25],
    ['P15', v2, 'verbal', yes, 24],
    ['P16', v2, 'electronic', { ...yes, direct_quotes: false }, 23],
    ['P17', v2, 'electronic', yes, 21],
    ['P18', v2, 'verbal', { ...yes, future_contact: false }, 19],
    ['P19', v2, 'electronic', yes, 17],
    ['P20', v2, 'electronic', yes, 15],
    ['P21', v2, 'verbal', yes, 13],
  ]
  for (const [pseudonym, form, method, clauses, daysAgo] of plan) {
    const p = byPseudonym.get(pseudonym)
    if (!p) continue
    const signedAt = new Date(Date.now() - daysAgo * 86_400_000)
    const obtainedBy = method === 'verbal' ? coordinator : null
    await manager.insert(ConsentRecord, {
      id: randomUUID(),
      studyId: study.id,
      participantId: p.id,
      formId: form.id,
      method,
      clauses,
      signerName: names.get(p.id) ?? pseudonym,
      signedAt,
      meaning: meaningFor(method, form.label, obtainedBy?.name ?? null, ''),
      obtainedById: obtainedBy?.id ?? null,
      obtainedByName: obtainedBy?.name ?? null,
      documentSha256: form.documentSha256,
      withdrawalTokenHash: method === 'electronic' ? newToken().hash : null,
      createdAt: signedAt,
    })
    await manager.update(Participant, { id: p.id }, { status: 'consented' })
    await manager.insert(ParticipantEvent, { studyId: study.id, participantId: p.id, kind: 'note', summary: `${method === 'verbal' ? 'Verbal' : 'Electronic'} consent on version ${form.label}`, at: signedAt, actorId: obtainedBy?.id ?? null, actorName: obtainedBy?.name ?? null, details: {} })
  }
  const withdrawn = byPseudonym.get('P08')
  if (withdrawn) {
    await manager.insert(Withdrawal, {
      studyId: study.id,
      participantId: withdrawn.id,
      scope: 'withdraw_data',
      effectiveDate: new Date(Date.now() - 9 * 86_400_000).toISOString().slice(0, 10),
      reason: 'Caring duties have increased.',
      withinDeadline: true,
      dataRemoved: true,
      recordedById: coordinator.id,
      recordedByName: coordinator.name,
    })
    await manager.update(Participant, { id: withdrawn.id }, { status: 'withdrawn' })
  }
  const waiting = byPseudonym.get('P09')
  if (waiting) {
    await manager.insert(ConsentLink, { studyId: study.id, participantId: waiting.id, formId: v2.id, tokenHash: newToken().hash, expiresAt: new Date(Date.now() + 10 * 86_400_000), createdById: coordinator.id })
  }
}
