import { z } from 'zod'
import { uuid } from './common.js'

/**
 * Analysis: inter-coder agreement for a study (per code and overall, on units of speaker turns or
 * sentences) and thematic saturation (Guest, Namey & Chen 2020). The computations are in
 * shared/analysis/; these are the request and response shapes.
 */

export const AGREEMENT_UNITS = ['turn', 'sentence'] as const
export const agreementUnit = z.enum(AGREEMENT_UNITS)
export type AgreementUnit = z.infer<typeof agreementUnit>

/** Per study: teams doing reflexive analysis switch agreement off; the unit of comparison. */
export const analysisSettings = z.strictObject({
  agreementEnabled: z.boolean(),
  agreementUnit,
})
export type AnalysisSettings = z.infer<typeof analysisSettings>

/** A coefficient, or why it cannot be computed here (never NaN). */
export const coefficient = z.union([
  z.object({ value: z.number(), band: z.object({ level: z.string(), label: z.string(), advice: z.string(), source: z.string() }) }),
  z.object({ value: z.null(), reason: z.string() }),
])
export type Coefficient = z.infer<typeof coefficient>

export const agreementQuery = z.strictObject({
  /** the coders to compare (two or more); default: every coder who coded at least one transcript another coder also coded */
  coderIds: z
    .union([uuid, z.array(uuid)])
    .optional()
    .transform((v) => (v === undefined ? undefined : Array.isArray(v) ? v : [v])),
})
export type AgreementQuery = z.input<typeof agreementQuery>

const codeAgreement = z.object({
  codeId: z.string(),
  label: z.string(),
  colour: z.string(),
  /** units in the compared transcripts, and how many of them each coder coded with this code */
  units: z.number(),
  codedBy: z.array(z.object({ coderId: z.string(), units: z.number() })),
  percentAgreement: z.number().nullable(),
  /** two coders only */
  kappa: coefficient.nullable(),
  alpha: coefficient,
})
export type CodeAgreement = z.infer<typeof codeAgreement>

export const agreementResponse = z.object({
  enabled: z.boolean(),
  unit: agreementUnit,
  coders: z.array(z.object({ id: z.string(), name: z.string() })),
  /** coders who could be compared (coded a transcript someone else also coded) */
  availableCoders: z.array(z.object({ id: z.string(), name: z.string() })),
  transcripts: z.array(z.object({ id: z.string(), pseudonym: z.string(), units: z.number() })),
  units: z.number(),
  overall: z.object({ percentAgreement: z.number().nullable(), kappa: coefficient.nullable(), alpha: coefficient }).nullable(),
  perCode: z.array(codeAgreement),
  /** units where the coders differ on a code, in transcript and reading order (the first 500) */
  disagreements: z.array(
    z.object({
      transcriptId: z.string(),
      pseudonym: z.string(),
      start: z.number(),
      end: z.number(),
      text: z.string(),
      codeId: z.string(),
      codedBy: z.array(z.string()),
      notCodedBy: z.array(z.string()),
    }),
  ),
  disagreementCount: z.number(),
  /** why there is nothing to show, in plain words, when that is so */
  emptyReason: z.string().nullable(),
})
export type AgreementResponse = z.infer<typeof agreementResponse>

export const saturationQuery = z.strictObject({
  baseSize: z.coerce.number().int().min(1).max(50).default(4),
  runLength: z.coerce.number().int().min(1).max(20).default(2),
  threshold: z.coerce.number().min(0).max(1).default(0.05),
  /** count one coder's codes only; default every coder's */
  coderId: uuid.optional(),
})
export type SaturationQuery = z.input<typeof saturationQuery>

export const saturationResponse = z.object({
  params: z.object({ baseSize: z.number(), runLength: z.number(), threshold: z.number() }),
  /** coded interviews in interview order */
  interviews: z.array(z.object({ transcriptId: z.string(), pseudonym: z.string(), interviewDate: z.string(), codes: z.number(), newCodes: z.number(), cumulative: z.number() })),
  status: z.enum(['reached', 'not-reached', 'too-few-interviews', 'empty-base']),
  reached: z.boolean(),
  saturationAt: z.number().nullable(),
  label: z.string().nullable(),
  baseCodes: z.number(),
  steps: z.array(z.object({ from: z.number(), to: z.number(), newCodes: z.number(), ratio: z.number(), meetsThreshold: z.boolean() })),
  reason: z.string().nullable(),
  /** a sentence a team can adapt for its methods section, with the citation */
  methodsSentence: z.string(),
  citation: z.string(),
})
export type SaturationResponse = z.infer<typeof saturationResponse>
