import { z } from 'zod'
import { email, requiredText, text } from './common.js'

/* ------------------------------------------------------------------ study recruitment settings */

const key = z
  .string()
  .trim()
  .min(1)
  .max(40)
  .regex(/^[a-z][a-z0-9_]*$/, 'Use lower-case letters, digits and underscores, starting with a letter.')

/** A sampling characteristic with its allowed values, e.g. region: north, south, west. */
export const samplingCharacteristic = z.strictObject({
  key,
  label: requiredText(80, 'The label'),
  values: z.array(z.strictObject({ value: key, label: requiredText(80, 'The label') })).min(1).max(20),
})
export type SamplingCharacteristic = z.infer<typeof samplingCharacteristic>

/** A purposive-sampling target for one value, or for a pair of values of two characteristics. */
export const samplingTarget = z.strictObject({
  cell: z.record(key, key).refine((c) => Object.keys(c).length >= 1 && Object.keys(c).length <= 2, 'A target is for one value or a pair of values.'),
  target: z.number().int().min(0).max(10000),
})
export type SamplingTarget = z.infer<typeof samplingTarget>

export const resourceLink = z.strictObject({
  title: requiredText(120, 'The title'),
  text: text(1000).default(''),
  url: z.union([z.url({ protocol: /^https?$/, message: 'Use a web address starting with http:// or https://.' }).max(500), z.literal('')]).default(''),
})
export type ResourceLink = z.infer<typeof resourceLink>

/** How long after taking part a participant can still have their data withdrawn (set by the ethics board). */
export const withdrawalRule = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('any_time') }),
  z.strictObject({ kind: z.literal('days_after_interview'), days: z.number().int().min(1).max(3650) }),
  z.strictObject({ kind: z.literal('until_date'), date: z.iso.date() }),
  z.strictObject({ kind: z.literal('until_analysis_starts') }),
])
export type WithdrawalRule = z.infer<typeof withdrawalRule>

export const recruitmentSettings = z.strictObject({
  recruiting: z.boolean(),
  publicSummary: text(3000),
  whoCanTakePart: text(3000),
  samplingCharacteristics: z.array(samplingCharacteristic).max(10),
  samplingTargets: z.array(samplingTarget).max(400),
  resources: z.array(resourceLink).max(30),
  withdrawalRule: withdrawalRule,
  /** days after a withdrawal of data before the participant's transcript files are deleted */
  dataRemovalGraceDays: z.number().int().min(0).max(3650),
})
export type RecruitmentSettings = z.infer<typeof recruitmentSettings>
export const recruitmentSettingsUpdate = recruitmentSettings.partial()
export type RecruitmentSettingsUpdate = z.infer<typeof recruitmentSettingsUpdate>

/* ------------------------------------------------------------------ screening questionnaire */

export const QUESTION_KINDS = ['yes_no', 'single_choice', 'multiple_choice', 'number', 'date', 'free_text'] as const
export type QuestionKind = (typeof QUESTION_KINDS)[number]
export const QUESTION_ROLES = ['inclusion', 'exclusion', 'information'] as const
export type QuestionRole = (typeof QUESTION_ROLES)[number]

/**
 * A structured rule: question, operator, value. No formula language. Operators by kind:
 * yes_no: is; single_choice: is, is_not, is_one_of; multiple_choice: includes_any, includes_all,
 * includes_none; number: gte, lte, gt, lt, eq, between; date: on_or_after, on_or_before,
 * within_last (a period counted back from the screening date). free_text takes no rule: a person
 * reviews it.
 */
export const ruleSchema = z.discriminatedUnion('operator', [
  z.strictObject({ operator: z.literal('is'), value: z.string().max(40) }),
  z.strictObject({ operator: z.literal('is_not'), value: z.string().max(40) }),
  z.strictObject({ operator: z.literal('is_one_of'), values: z.array(z.string().max(40)).min(1).max(20) }),
  z.strictObject({ operator: z.literal('includes_any'), values: z.array(z.string().max(40)).min(1).max(20) }),
  z.strictObject({ operator: z.literal('includes_all'), values: z.array(z.string().max(40)).min(1).max(20) }),
  z.strictObject({ operator: z.literal('includes_none'), values: z.array(z.string().max(40)).min(1).max(20) }),
  z.strictObject({ operator: z.enum(['gte', 'lte', 'gt', 'lt', 'eq']), value: z.number().finite() }),
  z.strictObject({ operator: z.literal('between'), min: z.number().finite(), max: z.number().finite() }),
  z.strictObject({ operator: z.enum(['on_or_after', 'on_or_before']), date: z.iso.date() }),
  z.strictObject({ operator: z.literal('within_last'), amount: z.number().int().min(1).max(1200), unit: z.enum(['days', 'months', 'years']) }),
])
export type Rule = z.infer<typeof ruleSchema>

export const questionOption = z.strictObject({ value: key, label: requiredText(200, 'The option') })

export const questionSchema = z.strictObject({
  id: key,
  text: requiredText(500, 'The question'),
  help: text(500).default(''),
  kind: z.enum(QUESTION_KINDS),
  required: z.boolean().default(true),
  options: z.array(questionOption).max(30).default([]),
  /** number questions: the allowed range of answers */
  min: z.number().finite().nullable().default(null),
  max: z.number().finite().nullable().default(null),
  role: z.enum(QUESTION_ROLES),
  rule: ruleSchema.nullable().default(null),
  /** when an exclusion rule matches, the reason recorded: help-seeking people are thanked and pointed to care */
  exclusionReason: z.enum(['excluded', 'help_seeking']).default('excluded'),
  /** the sampling characteristic this question's answer fills in (single choice only) */
  characteristic: key.nullable().default(null),
})
export type Question = z.infer<typeof questionSchema>

export const questionnaireInput = z.strictObject({
  intro: text(2000).default(''),
  questions: z.array(questionSchema).min(1, 'Add at least one question.').max(60),
})
export type QuestionnaireInput = z.infer<typeof questionnaireInput>

export const questionnaireSchema = questionnaireInput.extend({
  id: z.string(),
  version: z.number().int(),
  createdAt: z.string(),
  screeningCount: z.number().int(),
})
export type Questionnaire = z.infer<typeof questionnaireSchema>

/** Answers keyed by question id: yes_no 'yes'|'no', single 'value', multiple ['v',…], number, date 'YYYY-MM-DD', text. */
export const answerValue = z.union([z.string().max(2000), z.number().finite(), z.array(z.string().max(40)).max(30), z.null()])
export const answersSchema = z.record(key, answerValue)
export type Answers = z.infer<typeof answersSchema>

/* ------------------------------------------------------------------ eligibility */

export const OUTCOMES = ['eligible', 'not_eligible', 'needs_review'] as const
export type Outcome = (typeof OUTCOMES)[number]

export const criterionFinding = z.object({
  questionId: z.string(),
  question: z.string(),
  /** inclusion_not_met, exclusion_met (reason excluded or help_seeking), needs_review (missing or free text), invalid */
  kind: z.enum(['inclusion_not_met', 'exclusion_met', 'needs_review', 'invalid']),
  reason: z.enum(['excluded', 'help_seeking', 'missing', 'free_text', 'out_of_range', 'not_an_option', 'future_date']).nullable(),
  detail: z.string(),
})
export type CriterionFinding = z.infer<typeof criterionFinding>

export const eligibilityResult = z.object({
  outcome: z.enum(OUTCOMES),
  helpSeeking: z.boolean(),
  failing: z.array(criterionFinding),
  review: z.array(criterionFinding),
})
export type EligibilityResult = z.infer<typeof eligibilityResult>

/* ------------------------------------------------------------------ participants */

export const PARTICIPANT_STATUSES = ['enquired', 'screening', 'eligible', 'not_eligible', 'consented', 'withdrawn'] as const
export type ParticipantStatus = (typeof PARTICIPANT_STATUSES)[number]
export const REFERRAL_SOURCES = ['public_page', 'phone', 'email', 'clinic_referral', 'community_group', 'word_of_mouth', 'other'] as const
export type ReferralSource = (typeof REFERRAL_SOURCES)[number]

export const contactSchema = z.strictObject({
  name: requiredText(120, 'Your name'),
  email: z.union([email, z.literal('')]).default(''),
  phone: z
    .string()
    .trim()
    .max(40)
    .regex(/^[0-9+()\-.\s]*$/, 'Use digits, spaces and + ( ) - only in the phone number.')
    .default(''),
  country: text(80).default(''),
  timeZone: z
    .string()
    .max(60)
    .refine((tz) => tz === '' || isTimeZone(tz), 'Choose a time zone from the list.')
    .default(''),
})
export type Contact = z.infer<typeof contactSchema>

function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz })
    return true
  } catch {
    return false
  }
}

/** The public study page's submission. `website` is a honeypot: people never see it, robots fill it. */
export const publicEnquiry = z.strictObject({
  answers: answersSchema,
  contact: contactSchema.refine((c) => c.email !== '' || c.phone !== '', { message: 'Give an e-mail address or a phone number so the team can reach you.', path: ['email'] }),
  consentToContact: z.literal(true, { message: 'Tick the box to let the study team contact you.' }),
  website: z.string().max(200).optional(),
})
export type PublicEnquiry = z.infer<typeof publicEnquiry>

export const publicEnquiryResult = z.object({
  outcome: z.enum(['eligible', 'not_eligible', 'help_seeking', 'needs_review']),
  studyTitle: z.string(),
  resources: z.array(resourceLink),
})
export type PublicEnquiryResult = z.infer<typeof publicEnquiryResult>

export const publicStudy = z.object({
  code: z.string(),
  title: z.string(),
  publicSummary: z.string(),
  whoCanTakePart: z.string(),
  recruiting: z.boolean(),
  questionnaire: questionnaireInput.extend({ version: z.number() }).nullable(),
})
export type PublicStudy = z.infer<typeof publicStudy>

/** A coordinator enters an enquiry (or a phone screening) on someone's behalf. */
export const staffEnquiry = z.strictObject({
  contact: contactSchema,
  source: z.enum(REFERRAL_SOURCES),
  sourceDetail: text(200).default(''),
  /** screening answers, when screened now; omit to only log the enquiry */
  answers: answersSchema.optional(),
  note: text(2000).default(''),
})
export type StaffEnquiry = z.infer<typeof staffEnquiry>

export const rescreenRequest = z.strictObject({ answers: answersSchema, note: text(2000).default('') })
export const overrideRequest = z.strictObject({
  outcome: z.enum(['eligible', 'not_eligible']),
  reason: requiredText(2000, 'The reason'),
})
export type OverrideRequest = z.infer<typeof overrideRequest>

export const participantListQuery = z.strictObject({
  page: z.coerce.number().int().min(1).max(100000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  status: z.enum(PARTICIPANT_STATUSES).optional(),
  source: z.enum(REFERRAL_SOURCES).optional(),
  /** pseudonym, or (lead and coordinator only) name or e-mail */
  search: z.string().trim().max(100).optional(),
  sortBy: z.enum(['pseudonym', 'status', 'lastActivityAt']).default('pseudonym'),
  sortDesc: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
})
export type ParticipantListQuery = z.input<typeof participantListQuery>

export const participantRow = z.object({
  id: z.string(),
  pseudonym: z.string(),
  status: z.enum(PARTICIPANT_STATUSES),
  helpSeeking: z.boolean(),
  source: z.enum(REFERRAL_SOURCES),
  characteristics: z.record(z.string(), z.string()),
  lastActivityAt: z.string(),
  /** present only for the lead and coordinators */
  contact: contactSchema.extend({ email: z.string() }).optional(),
})
export type ParticipantRow = z.infer<typeof participantRow>
export const participantPage = z.object({ participants: z.array(participantRow), total: z.number(), page: z.number(), pageSize: z.number() })
export type ParticipantPage = z.infer<typeof participantPage>

export const timelineEvent = z.object({
  id: z.string(),
  at: z.string(),
  kind: z.enum(['enquiry', 'screening', 'override', 'email', 'note']),
  summary: z.string(),
  actor: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
})
export type TimelineEvent = z.infer<typeof timelineEvent>

export const screeningRecord = z.object({
  id: z.string(),
  at: z.string(),
  questionnaireVersion: z.number(),
  answers: answersSchema,
  result: eligibilityResult,
  screenedBy: z.string().nullable(),
})
export type ScreeningRecord = z.infer<typeof screeningRecord>

export const participantDetail = participantRow.extend({
  sourceDetail: z.string(),
  override: z.object({ outcome: z.enum(['eligible', 'not_eligible']), reason: z.string(), by: z.string(), at: z.string() }).nullable(),
  screenings: z.array(screeningRecord),
  timeline: z.array(timelineEvent),
})
export type ParticipantDetail = z.infer<typeof participantDetail>

/* ------------------------------------------------------------------ dashboard */

export const recruitmentSummary = z.object({
  funnel: z.object({ enquired: z.number(), screened: z.number(), eligible: z.number(), notEligible: z.number(), awaitingReview: z.number() }),
  notEnrolledReasons: z.array(z.object({ reason: z.string(), count: z.number() })),
  target: z.number().nullable(),
  sources: z.array(z.object({ source: z.enum(REFERRAL_SOURCES), count: z.number() })),
  matrix: z.array(z.object({ cell: z.record(z.string(), z.string()), label: z.string(), target: z.number(), enrolled: z.number() })),
})
export type RecruitmentSummary = z.infer<typeof recruitmentSummary>
