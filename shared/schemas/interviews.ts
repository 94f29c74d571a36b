import { z } from 'zod'
import { isoDate, requiredText, text } from './common.js'
import { isTimeZone } from '../interviews/time.js'

const zone = z.string().max(60).refine(isTimeZone, 'Choose a time zone from the list.')
const localDateTime = z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, 'Use a date and time like 2026-05-31T14:30.')

export const INTERVIEW_MODES = ['video', 'phone', 'in_person'] as const
export const INTERVIEW_STATUSES = ['scheduled', 'done', 'missed', 'cancelled'] as const

/* ---------------------------------------------------------------- interview guides */

export const interviewGuideCreate = z.strictObject({
  label: requiredText(60, 'The version label'),
  approvalDate: isoDate,
  text: requiredText(60000, 'The guide text'),
})
export type InterviewGuideCreate = z.infer<typeof interviewGuideCreate>

export const interviewGuideSchema = z.object({
  id: z.string(),
  label: z.string(),
  approvalDate: z.string(),
  text: z.string(),
  file: z.object({ name: z.string(), contentType: z.string(), size: z.number(), sha256: z.string() }),
  createdAt: z.string(),
})
export type InterviewGuide = z.infer<typeof interviewGuideSchema>
export const interviewGuideList = z.object({ guides: z.array(interviewGuideSchema) })

/* ---------------------------------------------------------------- interviews */

/** The time is typed as a wall clock in one person's zone; the server stores UTC and shows both. */
export const interviewSchedule = z.strictObject({
  participantId: z.uuid(),
  localTime: localDateTime,
  timeZoneOf: z.enum(['participant', 'interviewer']),
  participantTimeZone: zone,
  interviewerId: z.uuid(),
  interviewerTimeZone: zone,
  mode: z.enum(INTERVIEW_MODES),
  plannedMinutes: z.number().int().min(10).max(300),
  guideId: z.uuid().nullable().default(null),
})
export type InterviewSchedule = z.infer<typeof interviewSchedule>

export const interviewReschedule = interviewSchedule.omit({ participantId: true }).partial().strict()
export type InterviewReschedule = z.infer<typeof interviewReschedule>

export const interviewOutcome = z.strictObject({
  status: z.enum(['done', 'missed', 'cancelled']),
  actualMinutes: z.number().int().min(1).max(600).nullable().default(null),
  fieldNotes: text(20000).default(''),
})
export type InterviewOutcome = z.infer<typeof interviewOutcome>

export const interviewSchema = z.object({
  id: z.string(),
  participantId: z.string(),
  pseudonym: z.string(),
  scheduledAt: z.string(),
  participantTimeZone: z.string(),
  interviewerTimeZone: z.string(),
  /** the same moment on each side's clock */
  participantLocal: z.string(),
  interviewerLocal: z.string(),
  interviewerId: z.string(),
  interviewerName: z.string(),
  mode: z.enum(INTERVIEW_MODES),
  plannedMinutes: z.number(),
  actualMinutes: z.number().nullable(),
  guideId: z.string().nullable(),
  guideLabel: z.string().nullable(),
  fieldNotes: z.string(),
  status: z.enum(INTERVIEW_STATUSES),
  /** the participant declined audio recording: field notes only, no transcript */
  notesOnly: z.boolean(),
  transcriptCount: z.number(),
})
export type Interview = z.infer<typeof interviewSchema>
export const interviewList = z.object({ interviews: z.array(interviewSchema) })

/* ---------------------------------------------------------------- transcripts */

export const TRANSCRIPT_STATUSES = ['in_review', 'approved', 'rejected'] as const
export type TranscriptStatus = (typeof TRANSCRIPT_STATUSES)[number]

export const flagSchema = z.object({
  id: z.string(),
  start: z.number(),
  end: z.number(),
  category: z.string(),
  text: z.string(),
  /** 'scanner' flags come from the scan; 'manual' ones a person selected */
  source: z.enum(['scanner', 'manual', 'study-term']),
  decision: z.enum(['pending', 'accepted', 'rejected']),
})
export type Flag = z.infer<typeof flagSchema>

export const transcriptSummary = z.object({
  id: z.string(),
  interviewId: z.string(),
  participantId: z.string(),
  pseudonym: z.string(),
  interviewDate: z.string(),
  version: z.number(),
  status: z.enum(TRANSCRIPT_STATUSES),
  format: z.string(),
  wordCount: z.number(),
  createdAt: z.string(),
})
export type TranscriptSummary = z.infer<typeof transcriptSummary>
export const transcriptListResponse = z.object({ transcripts: z.array(transcriptSummary) })

/** The review screen (lead, coordinator): the parsed, still identifiable text and the flags. */
export const transcriptReview = transcriptSummary.extend({
  text: z.string(),
  turns: z.array(z.object({ speaker: z.string(), startMs: z.number().nullable(), start: z.number(), end: z.number() })),
  flags: z.array(flagSchema),
})
export type TranscriptReview = z.infer<typeof transcriptReview>

export const flagDecisions = z.strictObject({
  decisions: z
    .array(z.strictObject({ id: z.string().max(40), decision: z.enum(['accepted', 'rejected', 'pending']) }))
    .max(5000)
    .default([]),
  /** accept every occurrence of these terms (case-insensitive) in this transcript */
  acceptEverywhere: z.array(z.strictObject({ term: z.string().min(1).max(200), category: z.string().max(30) })).max(200).default([]),
  /** passages a person selected to redact by hand */
  manual: z.array(z.strictObject({ start: z.number().int().min(0), end: z.number().int().min(1), category: z.string().max(30) })).max(1000).default([]),
})
export type FlagDecisions = z.infer<typeof flagDecisions>

/** What coders read: the approved, de-identified text only. */
export const transcriptReading = transcriptSummary.extend({
  text: z.string(),
  sha256: z.string(),
  turns: z.array(z.object({ speaker: z.string(), startMs: z.number().nullable(), start: z.number(), end: z.number() })),
})
export type TranscriptReading = z.infer<typeof transcriptReading>

export const anonymisationLogEntry = z.object({
  id: z.string(),
  transcriptId: z.string(),
  pseudonym: z.string(),
  version: z.number(),
  original: z.string(),
  placeholder: z.string(),
  category: z.string(),
  by: z.string().nullable(),
  at: z.string(),
})
export const anonymisationLog = z.object({ entries: z.array(anonymisationLogEntry) })

/** The team's own list of terms the scan always flags, e.g. the local hospital or a small town. */
export const deidentificationTerms = z.strictObject({
  terms: z
    .array(z.strictObject({ term: z.string().trim().min(2, 'A term needs at least 2 characters.').max(200), category: z.string().max(30) }))
    .max(500),
})
export type DeidentificationTerms = z.infer<typeof deidentificationTerms>
