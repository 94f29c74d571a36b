import { z } from 'zod'
import { text, uuid } from './common.js'

/**
 * Reports: participant characteristics, the recruitment flow, quotes by theme, reporting checklists
 * (COREQ, SRQR) and a methods summary. Every table also downloads as CSV from
 * `GET /api/studies/:studyId/exports/<name>.csv` (EXPORT_NAMES).
 */

export const EXPORT_NAMES = ['characteristics', 'recruitment-flow', 'quotes-by-theme', 'codebook', 'coreq', 'srqr', 'audit'] as const
export type ExportName = (typeof EXPORT_NAMES)[number]
export const exportParams = z.strictObject({ studyId: uuid, name: z.enum(EXPORT_NAMES.map((n) => `${n}.csv`) as [string, ...string[]]) })
export const exportQuery = z.strictObject({
  /** a byte-order mark so spreadsheet programs read UTF-8 */
  bom: z.enum(['0', '1']).optional(),
  minCell: z.coerce.number().int().min(1).max(20).optional(),
})

/** A count with its percentage, or suppressed (shown as "<minCell"). */
export const cell = z.object({ count: z.number().nullable(), percent: z.number().nullable(), suppressed: z.boolean() })
export type Cell = z.infer<typeof cell>

export const characteristicsQuery = z.strictObject({ minCell: z.coerce.number().int().min(1).max(20).default(5) })
export const characteristicsReport = z.object({
  /** cells below this count are suppressed (1 = no suppression) */
  minCell: z.number(),
  roundingRule: z.string(),
  suppressionRule: z.string(),
  totals: z.object({ interviewed: z.number(), consented: z.number() }),
  groups: z.array(
    z.object({
      key: z.string(),
      label: z.string(),
      rows: z.array(z.object({ value: z.string(), label: z.string(), interviewed: cell, consented: cell })),
    }),
  ),
  /** interview durations in minutes, interviewed participants (null when none) */
  duration: z.object({ n: z.number(), mean: z.number(), median: z.number(), min: z.number(), max: z.number() }).nullable(),
  /** the characteristics chosen to label quotes combine into a group of one for some participants */
  quoteLabelWarning: z.object({ characteristics: z.array(z.string()), groupsOfOne: z.number() }).nullable(),
})
export type CharacteristicsReport = z.infer<typeof characteristicsReport>

export const FLOW_STAGES = ['enquired', 'screened', 'eligible', 'consented', 'interviewed', 'withdrawn'] as const
export const flowReport = z.object({
  stages: z.array(z.object({ key: z.enum(FLOW_STAGES), label: z.string(), count: z.number() })),
  /** why people left between stages, with counts */
  exits: z.array(z.object({ after: z.enum(FLOW_STAGES), reason: z.string(), count: z.number() })),
})
export type FlowReport = z.infer<typeof flowReport>

export const quotesReport = z.object({
  themes: z.array(
    z.object({
      id: z.string(),
      name: z.string(),
      status: z.string(),
      quotes: z.array(z.object({ text: z.string(), pseudonym: z.string(), characteristics: z.array(z.object({ label: z.string(), value: z.string() })) })),
    }),
  ),
  /** counts only: supporting excerpts left out, and why */
  leftOut: z.object({ declinedQuotation: z.number(), withdrawn: z.number() }),
  /** characteristics used to label quotes (the latest review round's choice, else none) */
  labelCharacteristics: z.array(z.string()),
})
export type QuotesReport = z.infer<typeof quotesReport>

export const CHECKLISTS = ['coreq', 'srqr'] as const
export const checklistName = z.enum(CHECKLISTS)
export type ChecklistName = z.infer<typeof checklistName>
export const checklistItem = z.object({
  number: z.string(),
  label: z.string(),
  domain: z.string(),
  where: z.string(),
  note: z.string(),
  done: z.boolean(),
})
export type ChecklistItem = z.infer<typeof checklistItem>
export const checklistReport = z.object({ name: checklistName, title: z.string(), source: z.string(), items: z.array(checklistItem), done: z.number(), total: z.number() })
export type ChecklistReport = z.infer<typeof checklistReport>
export const checklistParams = z.strictObject({ studyId: uuid, checklist: checklistName })
export const checklistItemParams = z.strictObject({ studyId: uuid, checklist: checklistName, number: z.string().max(4) })
export const checklistItemUpdate = z.strictObject({ where: text(500), note: text(2000), done: z.boolean() })
export type ChecklistItemUpdate = z.input<typeof checklistItemUpdate>

export const methodsSummary = z.object({
  /** paragraphs a team can adapt */
  paragraphs: z.array(z.string()),
  facts: z.object({
    interviews: z.number(),
    modes: z.array(z.object({ mode: z.string(), count: z.number() })),
    duration: z.object({ n: z.number(), mean: z.number(), median: z.number(), min: z.number(), max: z.number() }).nullable(),
    coders: z.number(),
    agreement: z.object({ unit: z.string(), alpha: z.number().nullable(), kappa: z.number().nullable(), percentAgreement: z.number().nullable() }).nullable(),
    saturation: z.string().nullable(),
    reviewRounds: z.number(),
    partnerAnswers: z.number(),
  }),
})
export type MethodsSummary = z.infer<typeof methodsSummary>
