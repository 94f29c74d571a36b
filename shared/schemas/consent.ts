import { z } from 'zod'
import { isoDate, requiredText, text } from './common.js'

const key = z
  .string()
  .trim()
  .min(1)
  .max(40)
  .regex(/^[a-z][a-z0-9_]*$/, 'Use lower-case letters, digits and underscores, starting with a letter.')

/* ------------------------------------------------------------------ form versions */

/**
 * An optional clause a consent form version asks about. Conventional keys the data-use policy
 * understands: audio_recording, direct_quotes, future_contact, share_deidentified.
 */
export const consentClause = z.strictObject({
  key,
  wording: requiredText(500, 'The wording'),
  /** true when the study cannot go ahead for this person without a yes */
  requiredForParticipation: z.boolean().default(false),
})
export type ConsentClause = z.infer<typeof consentClause>

export const CONSENT_FORM_STATUSES = ['draft', 'approved', 'superseded'] as const
export type ConsentFormStatus = (typeof CONSENT_FORM_STATUSES)[number]

const consentFormFields = {
  label: requiredText(60, 'The version label'),
  ethicsApprovalDate: isoDate,
  effectiveDate: isoDate,
  clauses: z.array(consentClause).max(20),
  /** the form's text as participants read it (shown on the e-consent page, used for readability) */
  text: requiredText(60000, 'The form text'),
}

/** The metadata sent with a new version's file (multipart field `metadata`, JSON). */
export const consentFormCreate = z.strictObject({ ...consentFormFields, clauses: consentFormFields.clauses.default([]) })
export type ConsentFormCreate = z.infer<typeof consentFormCreate>

/** A draft can still change; an approved version never does. `checklist` is the lead's own ticks. */
export const consentFormUpdate = z.strictObject(consentFormFields).partial().extend({ checklist: z.record(key, z.boolean()).optional() }).strict()
export type ConsentFormUpdate = z.infer<typeof consentFormUpdate>

export const consentFormSchema = z.object({
  id: z.string(),
  label: z.string(),
  status: z.enum(CONSENT_FORM_STATUSES),
  ethicsApprovalDate: z.string(),
  effectiveDate: z.string(),
  clauses: z.array(consentClause),
  text: z.string(),
  file: z.object({ name: z.string(), contentType: z.string(), size: z.number(), sha256: z.string() }),
  /** SHA-256 over the file's hash and the text: what a signature is bound to (21 CFR 11.70) */
  documentSha256: z.string(),
  checklist: z.record(z.string(), z.boolean()),
  approvedAt: z.string().nullable(),
  approvedBy: z.string().nullable(),
  createdAt: z.string(),
  consentCount: z.number(),
})
export type ConsentForm = z.infer<typeof consentFormSchema>
export const consentFormList = z.object({ forms: z.array(consentFormSchema) })

/* ------------------------------------------------------------------ consent records */

export const CONSENT_METHODS = ['written', 'verbal', 'electronic'] as const
export type ConsentMethod = (typeof CONSENT_METHODS)[number]

/** Clause answers: an explicit yes (true) or no (false) for every clause of the version. */
export const clauseAnswers = z.record(key, z.boolean())
export type ClauseAnswers = z.infer<typeof clauseAnswers>

/** Verbal consent, recorded by the person who obtained it (TCPS 2 Art. 3.12). Written consent sends the same fields as multipart `metadata` with the signed file. */
export const staffConsentInput = z.strictObject({
  formId: z.uuid(),
  clauses: clauseAnswers,
  /** the participant's name as they gave it */
  signerName: requiredText(120, 'The participant’s name'),
  /** when consent was given (ISO date-time); defaults to now */
  givenAt: z.iso.datetime({ offset: true }).optional(),
  witnessName: text(120).default(''),
  note: text(2000).default(''),
  /** a correction points to the record it corrects; records are never edited */
  corrects: z.uuid().optional(),
})
export type StaffConsentInput = z.infer<typeof staffConsentInput>

export const consentRecordSchema = z.object({
  id: z.string(),
  participantId: z.string(),
  formId: z.string(),
  formLabel: z.string(),
  formStatus: z.enum(CONSENT_FORM_STATUSES),
  method: z.enum(CONSENT_METHODS),
  clauses: clauseAnswers,
  signerName: z.string(),
  signedAt: z.string(),
  /** the meaning of the signature, shown wherever the record is (21 CFR 11.50) */
  meaning: z.string(),
  obtainedBy: z.string().nullable(),
  witnessName: z.string(),
  documentSha256: z.string(),
  signedFileName: z.string().nullable(),
  corrects: z.string().nullable(),
  correctedBy: z.string().nullable(),
  note: z.string(),
})
export type ConsentRecord = z.infer<typeof consentRecordSchema>

export const participantConsentView = z.object({
  records: z.array(consentRecordSchema),
  /** the record in force: the newest one that no later record corrects */
  current: consentRecordSchema.nullable(),
  links: z.array(z.object({ id: z.string(), formLabel: z.string(), sentAt: z.string(), expiresAt: z.string(), status: z.enum(['waiting', 'used', 'expired', 'revoked']) })),
  withdrawal: z.lazy(() => withdrawalSchema).nullable(),
})
export type ParticipantConsentView = z.infer<typeof participantConsentView>

/* ------------------------------------------------------------------ e-consent (public) */

export const publicConsentPage = z.object({
  studyTitle: z.string(),
  formLabel: z.string(),
  text: z.string(),
  fileName: z.string(),
  clauses: z.array(consentClause),
  /** the date the page shows beside the signature */
  today: z.string(),
})
export type PublicConsentPage = z.infer<typeof publicConsentPage>

export const publicConsentSubmit = z.strictObject({
  clauses: clauseAnswers,
  /** the typed full name is the signature */
  signerName: requiredText(120, 'Type your full name'),
  /** the person confirms they read the form and agree to take part */
  agree: z.literal(true, { message: 'Tick the box to confirm that you agree to take part.' }),
})
export type PublicConsentSubmit = z.infer<typeof publicConsentSubmit>

export const publicConsentResult = z.object({ signedAt: z.string(), signerName: z.string(), meaning: z.string(), formLabel: z.string(), studyTitle: z.string() })
export type PublicConsentResult = z.infer<typeof publicConsentResult>

/* ------------------------------------------------------------------ withdrawal */

export const WITHDRAWAL_SCOPES = ['stop_keep_data', 'withdraw_data'] as const
export type WithdrawalScope = (typeof WITHDRAWAL_SCOPES)[number]

export const withdrawalInput = z.strictObject({
  scope: z.enum(WITHDRAWAL_SCOPES),
  effectiveDate: isoDate,
  reason: text(2000).default(''),
  /** after the deadline: what the lead decided about the data, in words (required then) */
  decisionNote: text(2000).default(''),
  /** the request from the participant's own link this withdrawal answers, if any */
  requestId: z.uuid().optional(),
})
export type WithdrawalInput = z.infer<typeof withdrawalInput>

export const withdrawalSchema = z.object({
  id: z.string(),
  scope: z.enum(WITHDRAWAL_SCOPES),
  effectiveDate: z.string(),
  reason: z.string(),
  /** whether the data left the analysis (withdraw_data inside the study's deadline, or the lead's decision) */
  dataRemoved: z.boolean(),
  withinDeadline: z.boolean(),
  decisionNote: z.string(),
  recordedBy: z.string().nullable(),
  recordedAt: z.string(),
})
export type Withdrawal = z.infer<typeof withdrawalSchema>

export const publicWithdrawalPage = z.object({ studyTitle: z.string(), deadlineText: z.string(), alreadyRequested: z.boolean() })
export type PublicWithdrawalPage = z.infer<typeof publicWithdrawalPage>
export const publicWithdrawalSubmit = z.strictObject({ scope: z.enum(WITHDRAWAL_SCOPES), reason: text(2000).default('') })
export type PublicWithdrawalSubmit = z.infer<typeof publicWithdrawalSubmit>

export const withdrawalRequestSchema = z.object({
  id: z.string(),
  participantId: z.string(),
  pseudonym: z.string(),
  scope: z.enum(WITHDRAWAL_SCOPES),
  reason: z.string(),
  requestedAt: z.string(),
  status: z.enum(['open', 'recorded']),
})
export type WithdrawalRequest = z.infer<typeof withdrawalRequestSchema>

/* ------------------------------------------------------------------ dashboard */

export const consentSummary = z.object({
  ethicsExpiry: z.string().nullable(),
  perVersion: z.array(z.object({ formId: z.string(), label: z.string(), status: z.enum(CONSENT_FORM_STATUSES), consented: z.number() })),
  reconsentQueue: z.array(z.object({ participantId: z.string(), pseudonym: z.string(), formLabel: z.string(), linkWaiting: z.boolean() })),
  waitingLinks: z.array(z.object({ participantId: z.string(), pseudonym: z.string(), formLabel: z.string(), sentAt: z.string(), expiresAt: z.string() })),
  withdrawals: z.array(z.object({ participantId: z.string(), pseudonym: z.string(), scope: z.enum(WITHDRAWAL_SCOPES), effectiveDate: z.string(), dataRemoved: z.boolean() })),
  withdrawalRequests: z.array(withdrawalRequestSchema),
})
export type ConsentSummary = z.infer<typeof consentSummary>
