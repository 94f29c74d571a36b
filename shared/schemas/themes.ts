import { z } from 'zod'
import { isoDate, requiredText, text, uuid } from './common.js'

/**
 * Themes and patient partner review: themes built from codes and chosen excerpts, review rounds the
 * lead opens for patient partners, partners' answers, and the team's response to each.
 */

export const THEME_STATUSES = ['draft', 'with_partners', 'agreed'] as const
export const themeStatus = z.enum(THEME_STATUSES)
export type ThemeStatus = z.infer<typeof themeStatus>
export const THEME_STATUS_WORDS: Record<ThemeStatus, string> = { draft: 'Draft', with_partners: 'With partners', agreed: 'Agreed' }

/** A supporting excerpt the lead chose; only those shared with partners, and allowed by consent, ever reach them. */
export const themeExcerpt = z.object({
  excerptId: z.string(),
  shareWithPartners: z.boolean(),
  text: z.string(),
  pseudonym: z.string(),
  transcriptId: z.string(),
  start: z.number(),
  /** the participant allowed direct quotes and has not withdrawn their data */
  mayShowPartners: z.boolean(),
})
export type ThemeExcerpt = z.infer<typeof themeExcerpt>

export const themeSchema = z.object({
  id: z.string(),
  parentId: z.string().nullable(),
  position: z.number(),
  name: z.string(),
  description: z.string(),
  plainDescription: z.string(),
  /** Flesch–Kincaid grade of the plain-language description (lead and team only), null when too short */
  plainGrade: z.number().nullable(),
  status: themeStatus,
  codeIds: z.array(z.string()),
  excerpts: z.array(themeExcerpt),
  /** participants and excerpts behind the theme: its codes' excerpts (withdrawn data left out) */
  support: z.object({ participants: z.number(), excerpts: z.number() }),
  /** the theme is in a review round that is still open */
  inOpenRound: z.boolean(),
  version: z.number(),
  updatedAt: z.string(),
})
export type Theme = z.infer<typeof themeSchema>
export const themeListResponse = z.object({ themes: z.array(themeSchema) })

const themeFields = {
  name: requiredText(120, 'The theme name'),
  description: text(6000).optional(),
  plainDescription: text(3000).optional(),
  codeIds: z.array(uuid).max(200).optional(),
  excerpts: z.array(z.strictObject({ excerptId: uuid, shareWithPartners: z.boolean() })).max(100).optional(),
}
export const themeCreate = z.strictObject({ ...themeFields, parentId: uuid.nullable().optional() })
export type ThemeCreate = z.input<typeof themeCreate>
export const themeUpdate = z.strictObject({ version: z.number().int().min(1), ...themeFields, name: themeFields.name.optional(), status: themeStatus.optional() })
export type ThemeUpdate = z.input<typeof themeUpdate>
/** The whole order at once (drag to order): every theme's parent and position. */
export const themeOrder = z.strictObject({ order: z.array(z.strictObject({ id: uuid, parentId: uuid.nullable(), position: z.number().int().min(0) })).max(500) })
export type ThemeOrder = z.input<typeof themeOrder>
export const themeParams = z.strictObject({ studyId: uuid, themeId: uuid })

/* ---------- review rounds (the lead's side) ---------- */

export const VERDICTS = ['rings_true', 'needs_discussion', 'something_missing'] as const
export const verdict = z.enum(VERDICTS)
export type Verdict = z.infer<typeof verdict>
export const VERDICT_WORDS: Record<Verdict, string> = { rings_true: 'This rings true', needs_discussion: 'This needs talking through', something_missing: 'Something is missing' }

export const roundCreate = z.strictObject({
  title: requiredText(160, 'The round title'),
  themeIds: z.array(uuid).min(1, 'Choose at least one theme for the round.').max(50),
  closesOn: isoDate,
  /** participant characteristics shown beside each shared excerpt (keys of the study's sampling characteristics) */
  showCharacteristics: z.array(z.string().max(60)).max(10).default([]),
  message: text(2000).optional(),
})
export type RoundCreate = z.input<typeof roundCreate>

export const roundSummary = z.object({
  id: z.string(),
  title: z.string(),
  closesOn: z.string(),
  status: z.enum(['open', 'closed']),
  themeCount: z.number(),
  partners: z.number(),
  /** partners who submitted an answer to every theme */
  partnersDone: z.number(),
  createdAt: z.string(),
})
export type RoundSummary = z.infer<typeof roundSummary>
export const roundListResponse = z.object({ rounds: z.array(roundSummary) })

export const answerSchema = z.object({
  id: z.string(),
  themeId: z.string(),
  partnerId: z.string(),
  partnerName: z.string(),
  verdict: verdict.nullable(),
  comment: z.string(),
  /** the partner's note, only when they chose to share it */
  sharedNote: z.string().nullable(),
  submittedAt: z.string().nullable(),
  /** what the team did with it, shown back to the partner */
  response: z.string(),
  respondedAt: z.string().nullable(),
})
export type Answer = z.infer<typeof answerSchema>

export const roundDetail = roundSummary.extend({
  showCharacteristics: z.array(z.string()),
  message: z.string(),
  themes: z.array(z.object({ id: z.string(), name: z.string(), deleted: z.boolean() })),
  partnerList: z.array(z.object({ id: z.string(), name: z.string() })),
  answers: z.array(answerSchema),
})
export type RoundDetail = z.infer<typeof roundDetail>
export const roundParams = z.strictObject({ studyId: uuid, roundId: uuid })
export const answerParams = z.strictObject({ studyId: uuid, roundId: uuid, answerId: uuid })
export const answerResponse = z.strictObject({ response: requiredText(4000, 'The response') })

/* ---------- the partner's side ---------- */

export const partnerRoundSummary = z.object({ id: z.string(), title: z.string(), closesOn: z.string(), status: z.enum(['open', 'closed']), themeCount: z.number(), answered: z.number() })
export const partnerRoundListResponse = z.object({ rounds: z.array(partnerRoundSummary) })

export const partnerTheme = z.object({
  id: z.string(),
  name: z.string(),
  plainDescription: z.string(),
  /** shared excerpts the participant allowed to be quoted: text, pseudonym and the chosen characteristics only */
  quotes: z.array(z.object({ text: z.string(), pseudonym: z.string(), characteristics: z.array(z.object({ label: z.string(), value: z.string() })) })),
  answer: z.object({
    verdict: verdict.nullable(),
    comment: z.string(),
    note: z.string(),
    shareNote: z.boolean(),
    submittedAt: z.string().nullable(),
    response: z.string(),
    respondedAt: z.string().nullable(),
  }),
})
export type PartnerTheme = z.infer<typeof partnerTheme>
export const partnerRound = partnerRoundSummary.extend({ message: z.string(), themes: z.array(partnerTheme) })
export type PartnerRound = z.infer<typeof partnerRound>
export const partnerThemeParams = z.strictObject({ studyId: uuid, roundId: uuid, themeId: uuid })
/** Save a draft (submit false) or send the answer (submit true: a verdict is then required). */
export const partnerAnswerInput = z
  .strictObject({
    verdict: verdict.nullable(),
    comment: text(4000),
    note: text(4000).default(''),
    shareNote: z.boolean().default(false),
    submit: z.boolean(),
  })
  .refine((a) => !a.submit || a.verdict !== null, { message: 'Choose one of the three answers before sending.', path: ['verdict'] })
export type PartnerAnswerInput = z.input<typeof partnerAnswerInput>
