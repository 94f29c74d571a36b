import { z } from 'zod'
import { requiredText, text, uuid } from './common.js'

/**
 * Coding: the codebook (hierarchical codes), excerpts (a coder's codes on a span of one transcript
 * version), memos, search and the code matrices. Offsets are UTF-16 code units — JavaScript string
 * indices — on both sides (shared/coding/offsets.ts).
 */

/** Okabe & Ito (2008), "Color Universal Design": eight colours told apart with every common colour-vision deficiency. */
export const OKABE_ITO = [
  { hex: '#E69F00', name: 'Orange' },
  { hex: '#56B4E9', name: 'Sky blue' },
  { hex: '#009E73', name: 'Bluish green' },
  { hex: '#F0E442', name: 'Yellow' },
  { hex: '#0072B2', name: 'Blue' },
  { hex: '#D55E00', name: 'Vermilion' },
  { hex: '#CC79A7', name: 'Reddish purple' },
  { hex: '#000000', name: 'Black' },
] as const
export const codeColour = z.enum(OKABE_ITO.map((c) => c.hex) as [string, ...string[]], {
  message: 'Choose one of the eight colour-blind-safe colours.',
})

export const CODE_STATUSES = ['active', 'merged', 'retired'] as const
export const codeStatus = z.enum(CODE_STATUSES)
export type CodeStatus = z.infer<typeof codeStatus>

/** Letters, digits, spaces and ordinary punctuation; no control characters or markup brackets. */
export const codeLabel = requiredText(80, 'The code label').refine((v) => !/[\p{Cc}<>]/u.test(v), {
  message: 'Use letters, digits, spaces and ordinary punctuation in a code label (no < or > and no control characters).',
})

export const codeSchema = z.object({
  id: z.string(),
  parentId: z.string().nullable(),
  position: z.number(),
  label: z.string(),
  definition: z.string(),
  whenToUse: z.string(),
  whenNotToUse: z.string(),
  /** an excerpt that shows the code in use; the codebook links to it in the coding view */
  exampleExcerptId: z.string().nullable(),
  example: z.object({ transcriptId: z.string(), text: z.string(), pseudonym: z.string() }).nullable(),
  colour: z.string(),
  status: codeStatus,
  mergedIntoId: z.string().nullable(),
  /** optimistic-lock version: send it back with every change */
  version: z.number(),
  /** excerpts carrying this code (all coders, withdrawn data excluded) */
  excerptCount: z.number(),
  updatedAt: z.string(),
})
export type Code = z.infer<typeof codeSchema>

/** The whole codebook as a flat list ordered by (parent, position); the client builds the tree. */
export const codebookResponse = z.object({ codes: z.array(codeSchema) })

const codeFields = {
  label: codeLabel,
  definition: text(4000).optional(),
  whenToUse: text(2000).optional(),
  whenNotToUse: text(2000).optional(),
  colour: codeColour.optional(),
  exampleExcerptId: uuid.nullable().optional(),
}
export const codeCreate = z.strictObject({ ...codeFields, parentId: uuid.nullable().optional() })
export type CodeCreate = z.input<typeof codeCreate>

export const codeUpdate = z.strictObject({
  version: z.number().int().min(1),
  ...codeFields,
  label: codeLabel.optional(),
  /** retire a code (kept on existing excerpts, not offered for new ones) or bring it back */
  status: z.enum(['active', 'retired']).optional(),
})
export type CodeUpdate = z.input<typeof codeUpdate>

/** Nest under another code (or at the top with null) and place at `position` among its siblings. */
export const codeMove = z.strictObject({ version: z.number().int().min(1), parentId: uuid.nullable(), position: z.number().int().min(0).max(10000) })
export type CodeMove = z.input<typeof codeMove>

/** Merge this code into `intoId`: its excerpts move to the target; the code stays in the book as merged. */
export const codeMerge = z.strictObject({ version: z.number().int().min(1), intoId: uuid })
export type CodeMerge = z.input<typeof codeMerge>

/** Split: a new code beside this one takes over the chosen excerpts. */
export const codeSplit = z.strictObject({
  version: z.number().int().min(1),
  newCode: z.strictObject(codeFields),
  excerptIds: z.array(uuid).min(1, 'Choose at least one excerpt for the new code.').max(5000),
})
export type CodeSplit = z.input<typeof codeSplit>

export const codeParams = z.strictObject({ studyId: uuid, codeId: uuid })

/** CSV import: the file's text; `dryRun` checks every row and changes nothing. */
export const codebookImport = z.strictObject({ csv: z.string().min(1, 'The file is empty.').max(1_000_000, 'A codebook file is at most 1 MB.'), dryRun: z.boolean().default(false) })
export type CodebookImport = z.input<typeof codebookImport>
export const codebookImportResult = z.object({
  created: z.number(),
  updated: z.number(),
  unchanged: z.number(),
  dryRun: z.boolean(),
})
/* A file with mistakes is refused whole (nothing imported) with 422 problem details whose `errors`
   carry one entry per mistake: path `<row>.<column>` (data rows count from 1, the header is not a
   row) and a message that names the row. */
export type CodebookImportResult = z.infer<typeof codebookImportResult>

export const snapshotCode = z.object({
  id: z.string(),
  parentId: z.string().nullable(),
  position: z.number(),
  label: z.string(),
  definition: z.string(),
  whenToUse: z.string(),
  whenNotToUse: z.string(),
  colour: z.string(),
  status: codeStatus,
})
export type SnapshotCode = z.infer<typeof snapshotCode>
export const snapshotSummary = z.object({ id: z.string(), name: z.string(), codeCount: z.number(), createdBy: z.string(), createdAt: z.string() })
export const snapshotListResponse = z.object({ snapshots: z.array(snapshotSummary) })
export const snapshotDetail = snapshotSummary.extend({ codes: z.array(snapshotCode) })
export type SnapshotDetail = z.infer<typeof snapshotDetail>
export const snapshotCreate = z.strictObject({ name: requiredText(120, 'The snapshot name') })
export const snapshotParams = z.strictObject({ studyId: uuid, snapshotId: uuid })

/* ---------- excerpts ---------- */

export const excerptSchema = z.object({
  id: z.string(),
  transcriptId: z.string(),
  coderId: z.string(),
  coderName: z.string(),
  start: z.number(),
  end: z.number(),
  text: z.string(),
  codeIds: z.array(z.string()),
  version: z.number(),
  createdAt: z.string(),
  updatedAt: z.string(),
})
export type Excerpt = z.infer<typeof excerptSchema>

export const excerptRange = {
  start: z.number().int().min(0).max(10_000_000),
  end: z.number().int().min(1).max(10_000_000),
  /** the selected text as the client sees it: the server checks it against the transcript */
  text: z.string().min(1).max(100_000),
}
const codeIds = z.array(uuid).min(1, 'Apply at least one code.').max(30).refine((ids) => new Set(ids).size === ids.length, 'Each code once.')

export const excerptCreate = z.strictObject({ ...excerptRange, codeIds })
export type ExcerptCreate = z.input<typeof excerptCreate>
export const excerptUpdate = z.strictObject({
  version: z.number().int().min(1),
  start: excerptRange.start.optional(),
  end: excerptRange.end.optional(),
  text: excerptRange.text.optional(),
  codeIds: codeIds.optional(),
})
export type ExcerptUpdate = z.input<typeof excerptUpdate>
export const excerptParams = z.strictObject({ studyId: uuid, excerptId: uuid })
export const excerptDeleteQuery = z.strictObject({ version: z.coerce.number().int().min(1) })

/** Whose coding to load: your own (default) or another coder's, when the study allows comparison. */
export const excerptListQuery = z.strictObject({ coderId: uuid.optional() })
export const excerptListResponse = z.object({
  excerpts: z.array(excerptSchema),
  /** coders with coding on this transcript; others than you only when comparison is on */
  coders: z.array(z.object({ id: z.string(), name: z.string(), excerptCount: z.number() })),
  comparisonAllowed: z.boolean(),
})
export type ExcerptList = z.infer<typeof excerptListResponse>

/** Excerpts carrying one code across the study (for splitting a code and choosing its example). */
export const codeExcerptsQuery = z.strictObject({ codeId: uuid })
export const codeExcerptsResponse = z.object({ excerpts: z.array(excerptSchema.extend({ pseudonym: z.string() })) })
export type CodeExcerpts = z.infer<typeof codeExcerptsResponse>

/* ---------- coding settings ---------- */

export const codingSettings = z.strictObject({
  /** coders may show another coder's coding beside their own */
  coderComparison: z.boolean(),
})
export type CodingSettings = z.infer<typeof codingSettings>

/* ---------- memos ---------- */

export const MEMO_TARGETS = ['study', 'transcript', 'excerpt', 'code'] as const
export const memoTarget = z.enum(MEMO_TARGETS)
export type MemoTarget = z.infer<typeof memoTarget>
export const memoSchema = z.object({
  id: z.string(),
  targetType: memoTarget,
  targetId: z.string().nullable(),
  /** a short readable name of what the memo is about: "Study", "Transcript of P03", "Code: Fatigue" */
  targetLabel: z.string(),
  /** where to open it: the transcript (for transcript and excerpt memos) and offset */
  transcriptId: z.string().nullable(),
  body: z.string(),
  authorId: z.string(),
  authorName: z.string(),
  version: z.number(),
  createdAt: z.string(),
  updatedAt: z.string(),
})
export type Memo = z.infer<typeof memoSchema>
export const memoCreate = z
  .strictObject({ targetType: memoTarget, targetId: uuid.nullable().default(null), body: requiredText(20_000, 'The memo') })
  .refine((m) => (m.targetType === 'study') === (m.targetId === null), { message: 'A study memo has no target; every other memo needs one.', path: ['targetId'] })
export type MemoCreate = z.input<typeof memoCreate>
export const memoUpdate = z.strictObject({ version: z.number().int().min(1), body: requiredText(20_000, 'The memo') })
export type MemoUpdate = z.input<typeof memoUpdate>
export const memoParams = z.strictObject({ studyId: uuid, memoId: uuid })
export const memoListQuery = z.strictObject({
  targetType: memoTarget.optional(),
  targetId: uuid.optional(),
  q: z.string().trim().max(200).optional(),
})
export const memoListResponse = z.object({ memos: z.array(memoSchema) })

/* ---------- search ---------- */

export const searchQuery = z.strictObject({
  q: z.string().trim().min(1, 'Type a word or phrase to search for.').max(200),
  in: z.enum(['all', 'excerpts', 'transcripts']).default('all'),
  codeId: uuid.optional(),
  coderId: uuid.optional(),
  transcriptId: uuid.optional(),
  /** a participant characteristic as `key=value`, e.g. `region=rural` */
  characteristic: z
    .string()
    .max(200)
    .regex(/^[^=]+=.+$/, 'Write a characteristic as name=value.')
    .optional(),
})
export type SearchQuery = z.input<typeof searchQuery>
/** A hit with its context; `highlights` are [start, end) offsets into `context`. */
export const searchHit = z.object({
  kind: z.enum(['excerpt', 'transcript']),
  transcriptId: z.string(),
  pseudonym: z.string(),
  /** offset in the transcript where the hit's context starts, to jump to in the coding view */
  start: z.number(),
  end: z.number(),
  speaker: z.string().nullable(),
  context: z.string(),
  highlights: z.array(z.tuple([z.number(), z.number()])),
  excerptId: z.string().nullable(),
  coderName: z.string().nullable(),
  codeIds: z.array(z.string()),
})
export type SearchHit = z.infer<typeof searchHit>
export const searchResponse = z.object({ hits: z.array(searchHit), total: z.number(), truncated: z.boolean() })
export type SearchResponse = z.infer<typeof searchResponse>

/* ---------- matrices ---------- */

export const matrixQuery = z.strictObject({ coderId: uuid.optional(), bom: z.enum(['0', '1']).optional() })
const matrixCode = z.object({ id: z.string(), label: z.string(), colour: z.string(), parentId: z.string().nullable() })
/** excerpt counts per code and participant (rows: codes; columns: participants) */
export const codeParticipantMatrix = z.object({
  codes: z.array(matrixCode),
  participants: z.array(z.object({ id: z.string(), pseudonym: z.string() })),
  cells: z.array(z.object({ codeId: z.string(), participantId: z.string(), count: z.number() })),
  /** excerpts left out because the participant's data may not be used (counts only) */
  excluded: z.number(),
})
export type CodeParticipantMatrix = z.infer<typeof codeParticipantMatrix>
/** how often two codes fall on the same or overlapping passages of one coder; the diagonal is each code's excerpt count */
export const coOccurrenceMatrix = z.object({
  codes: z.array(matrixCode),
  cells: z.array(z.object({ a: z.string(), b: z.string(), count: z.number() })),
  excluded: z.number(),
})
export type CoOccurrenceMatrix = z.infer<typeof coOccurrenceMatrix>
