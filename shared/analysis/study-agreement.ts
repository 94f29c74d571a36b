import { trimRange } from '../coding/offsets.js'
import { AgreementUndefinedError, binaryAgreementFromCounts, krippendorffAlphaFromCoincidences, tryAgreement, type AgreementOutcome } from './agreement.js'

/**
 * Agreement for a study: the transcripts are cut into units (speaker turns or sentences); a unit
 * counts as coded with a code by a coder when any of that coder's excerpts with that code overlaps
 * it. Per code, each unit is then "applied" or "not applied" for each coder who coded the transcript,
 * and the coefficients come from counts (no per-unit strings), so 2 coders × 30,000 units × 60 codes
 * stay well under a second.
 */

export interface Span {
  start: number
  end: number
}

export interface CodedExcerpt extends Span {
  transcriptId: string
  coderId: string
  codeIds: readonly string[]
}

export interface UnitRef extends Span {
  transcriptId: string
}

export interface CodeResult {
  codeId: string
  /** units each coder coded with this code, in `coderIds` order */
  codedBy: number[]
  /** share of pairable units where every coder present agreed; null when no unit is pairable */
  percentAgreement: number | null
  /** Cohen's kappa, two coders only (null for more) */
  kappa: AgreementOutcome | null
  /** Krippendorff's alpha, nominal, any number of coders, missing coders per transcript allowed */
  alpha: AgreementOutcome
}

export interface Disagreement extends UnitRef {
  codeId: string
  codedBy: string[]
  notCodedBy: string[]
}

export interface StudyAgreement {
  /** units in transcripts coded by at least two of the coders */
  units: number
  transcripts: { transcriptId: string; units: number; coders: string[] }[]
  perCode: CodeResult[]
  overall: Omit<CodeResult, 'codeId' | 'codedBy'>
  disagreements: Disagreement[]
  disagreementCount: number
}

const sentences = new Intl.Segmenter('en', { granularity: 'sentence' })

/** Units of one transcript: its turns, or the sentences inside its turns (white space trimmed, empty ones dropped). */
export function unitsOf(text: string, turns: readonly Span[], unit: 'turn' | 'sentence'): Span[] {
  const out: Span[] = []
  for (const turn of turns) {
    if (unit === 'turn') {
      out.push(trimmed(text, turn.start, turn.end))
      continue
    }
    for (const { index, segment } of sentences.segment(text.slice(turn.start, turn.end))) out.push(trimmed(text, turn.start + index, turn.start + index + segment.length))
  }
  return out.filter((s) => s.end > s.start)
}

function trimmed(text: string, start: number, end: number): Span {
  const [s, e] = trimRange(text, start, end)
  return { start: s, end: e }
}

/** Index of the first unit whose end lies after `position` (units sorted, not overlapping). */
function firstEndingAfter(units: readonly Span[], position: number): number {
  let low = 0
  let high = units.length
  while (low < high) {
    const middle = (low + high) >> 1
    if (units[middle]!.end <= position) low = middle + 1
    else high = middle
  }
  return low
}

export function studyAgreement(input: {
  units: ReadonlyMap<string, readonly Span[]>
  excerpts: readonly CodedExcerpt[]
  coderIds: readonly string[]
  codeIds: readonly string[]
  maxDisagreements?: number
}): StudyAgreement {
  const { coderIds, codeIds } = input
  const coderIndex = new Map(coderIds.map((id, i) => [id, i]))
  const codeIndex = new Map(codeIds.map((id, i) => [id, i]))
  // which coders coded which transcript: only transcripts two or more of them coded are compared
  const codersOf = new Map<string, Set<number>>()
  for (const e of input.excerpts) {
    const c = coderIndex.get(e.coderId)
    if (c === undefined || !input.units.has(e.transcriptId)) continue
    if (!codersOf.has(e.transcriptId)) codersOf.set(e.transcriptId, new Set())
    codersOf.get(e.transcriptId)!.add(c)
  }
  const transcripts = [...input.units.keys()].filter((id) => (codersOf.get(id)?.size ?? 0) >= 2)
  const offset = new Map<string, number>()
  const unitRefs: UnitRef[] = []
  const present: number[][] = [] // coders present per unit
  for (const id of transcripts) {
    offset.set(id, unitRefs.length)
    const coders = [...codersOf.get(id)!].sort((a, b) => a - b)
    for (const u of input.units.get(id)!) {
      unitRefs.push({ transcriptId: id, start: u.start, end: u.end })
      present.push(coders)
    }
  }
  const total = unitRefs.length
  // flags[code][coder] = units (global index) where that coder applied the code
  const flags = codeIds.map(() => coderIds.map(() => new Uint8Array(total)))
  for (const e of input.excerpts) {
    const c = coderIndex.get(e.coderId)
    const base = offset.get(e.transcriptId)
    if (c === undefined || base === undefined) continue
    const units = input.units.get(e.transcriptId)!
    for (let u = firstEndingAfter(units, e.start); u < units.length && units[u]!.start < e.end; u++) {
      for (const codeId of e.codeIds) {
        const k = codeIndex.get(codeId)
        if (k !== undefined) flags[k]![c]![base + u] = 1
      }
    }
  }
  const two = coderIds.length === 2
  const max = input.maxDisagreements ?? 500
  const disagreements: Disagreement[] = []
  let disagreementCount = 0
  const pooled = { both: 0, onlyA: 0, onlyB: 0, neither: 0, o00: 0, o01: 0, o11: 0, agree: 0, pairable: 0 }
  const perCode = codeIds.map((codeId, k): CodeResult => {
    const byCoder = flags[k]!
    const counts = { both: 0, onlyA: 0, onlyB: 0, neither: 0 }
    let o00 = 0
    let o01 = 0
    let o11 = 0
    let agree = 0
    let pairable = 0
    for (let u = 0; u < total; u++) {
      const coders = present[u]!
      const m = coders.length
      let ones = 0
      for (const c of coders) ones += byCoder[c]![u]!
      pairable++
      // Krippendorff (2011): each pairable unit adds 1/(m − 1) per ordered pair of its values
      o11 += (ones * (ones - 1)) / (m - 1)
      o00 += ((m - ones) * (m - ones - 1)) / (m - 1)
      o01 += (ones * (m - ones)) / (m - 1)
      if (ones === 0 || ones === m) agree++
      else {
        disagreementCount++
        if (disagreements.length < max) {
          disagreements.push({ ...unitRefs[u]!, codeId, codedBy: coders.filter((c) => byCoder[c]![u]).map((c) => coderIds[c]!), notCodedBy: coders.filter((c) => !byCoder[c]![u]).map((c) => coderIds[c]!) })
        }
      }
      if (two && m === 2) {
        const a = byCoder[0]![u]!
        const b = byCoder[1]![u]!
        if (a && b) counts.both++
        else if (a) counts.onlyA++
        else if (b) counts.onlyB++
        else counts.neither++
      }
    }
    pooled.both += counts.both
    pooled.onlyA += counts.onlyA
    pooled.onlyB += counts.onlyB
    pooled.neither += counts.neither
    pooled.o00 += o00
    pooled.o01 += o01
    pooled.o11 += o11
    pooled.agree += agree
    pooled.pairable += pairable
    return {
      codeId,
      codedBy: coderIds.map((_, c) => byCoder[c]!.reduce((sum, bit) => sum + bit, 0)),
      ...coefficients(two, counts, o00, o01, o11, agree, pairable),
    }
  })
  disagreements.sort((a, b) => transcripts.indexOf(a.transcriptId) - transcripts.indexOf(b.transcriptId) || a.start - b.start)
  return {
    units: total,
    transcripts: transcripts.map((id) => ({ transcriptId: id, units: input.units.get(id)!.length, coders: [...codersOf.get(id)!].map((c) => coderIds[c]!) })),
    perCode,
    overall: coefficients(two, pooled, pooled.o00, pooled.o01, pooled.o11, pooled.agree, pooled.pairable),
    disagreements,
    disagreementCount,
  }
}

function coefficients(two: boolean, counts: { both: number; onlyA: number; onlyB: number; neither: number }, o00: number, o01: number, o11: number, agree: number, pairable: number) {
  // with no units, binaryAgreementFromCounts throws `no-units`; tryAgreement turns that into its reason
  const kappa = two ? tryAgreement(() => {
    const outcome = binaryAgreementFromCounts(counts).kappa
    if ('value' in outcome) return outcome.value
    throw new AgreementUndefinedError(outcome.undefined, outcome.message)
  }) : null
  return {
    percentAgreement: pairable > 0 ? agree / pairable : null,
    kappa,
    alpha: tryAgreement(() => krippendorffAlphaFromCoincidences([[o00, o01], [o01, o11]], 'nominal').alpha),
  }
}
