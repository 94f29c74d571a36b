/**
 * Thematic saturation after Guest, Namey & Chen (2020), PLOS ONE 15(5): e0232076. The unique codes of the first
 * `baseSize` interviews form the base; a run is `runLength` consecutive interviews after it; a run's
 * new-information ratio is (codes first seen in the run) / (codes in the base), the base staying the denominator.
 * Runs advance one interview at a time; saturation is reached at the first run whose ratio is at or below
 * `threshold`, and reported as "X+Y": X interviews before that run, Y its length.
 */

export interface SaturationParams {
  /** interviews whose unique codes form the denominator (4 in the paper's worked choice) */
  baseSize: number
  /** consecutive interviews counted together after the base (2 or 3 in the paper) */
  runLength: number
  /** share of new information (0–1) at or below which a run counts as saturated: 0.05, or 0 for the strict case */
  threshold: number
}

export const DEFAULT_SATURATION: Readonly<SaturationParams> = Object.freeze({ baseSize: 4, runLength: 2, threshold: 0.05 })

/** One run, with 1-based interview numbers. */
export interface SaturationStep {
  from: number
  to: number
  /** codes first seen in this run (not in any earlier interview) */
  newCodes: number
  /** newCodes / baseCodes */
  ratio: number
  /** the ratio is at or below the threshold */
  meetsThreshold: boolean
}

export type SaturationStatus = 'reached' | 'not-reached' | 'too-few-interviews' | 'empty-base'

export interface SaturationResult {
  status: SaturationStatus
  reached: boolean
  /** X in "X+Y": interviews analysed before the first run that met the threshold */
  saturationAt: number | null
  /** "X+Y", or null when not reached */
  label: string | null
  /** plain-English explanation when not reached, else null */
  reason: string | null
  params: SaturationParams
  interviews: number
  /** unique codes in the base; the denominator of every ratio */
  baseCodes: number
  /** codes first seen in each interview, in interview order */
  newPerInterview: number[]
  /** unique codes seen up to and including each interview */
  cumulative: number[]
  /** every run from the one right after the base to the last full run */
  steps: SaturationStep[]
}

/** Parameters outside their allowed range; `field` names the one at fault. */
export class SaturationParamsError extends RangeError {
  readonly field: keyof SaturationParams
  constructor(field: keyof SaturationParams, message: string) {
    super(message)
    this.name = 'SaturationParamsError'
    this.field = field
  }
}

function checkParams({ baseSize, runLength, threshold }: SaturationParams): void {
  if (!Number.isInteger(baseSize) || baseSize < 1) throw new SaturationParamsError('baseSize', 'The base must be a whole number of interviews, at least 1.')
  if (!Number.isInteger(runLength) || runLength < 1) throw new SaturationParamsError('runLength', 'A run must be a whole number of interviews, at least 1.')
  if (!(threshold >= 0 && threshold <= 1)) throw new SaturationParamsError('threshold', 'The new-information threshold must lie between 0% and 100%.')
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`
const firstInterviews = (n: number) => (n === 1 ? 'The first interview has' : `The first ${n} interviews have`)

/**
 * Assesses saturation from the code ids applied in each interview, in interview order (duplicates within an
 * interview count once; ids compare by value, so `1` and `'1'` differ). Too few interviews or a base without
 * codes give `reached: false` with a `reason`; only invalid parameters throw ({@link SaturationParamsError}).
 * Parameters left out take {@link DEFAULT_SATURATION}.
 */
export function assessSaturation(
  codeSets: readonly (readonly (string | number)[])[],
  options: Partial<SaturationParams> = {},
): SaturationResult {
  const params = { ...DEFAULT_SATURATION, ...options }
  checkParams(params)
  const { baseSize, runLength, threshold } = params
  const seen = new Set<string | number>()
  const newPerInterview = codeSets.map((codes) => {
    const before = seen.size
    for (const code of codes) seen.add(code)
    return seen.size - before
  })
  const cumulative: number[] = []
  let total = 0
  for (const n of newPerInterview) cumulative.push((total += n))
  const interviews = codeSets.length
  const baseCodes = interviews >= baseSize ? cumulative[baseSize - 1] : 0
  const result = (status: SaturationStatus, steps: SaturationStep[], reason: string | null, at: number | null = null): SaturationResult => ({
    status,
    reached: status === 'reached',
    saturationAt: at,
    label: at === null ? null : `${at}+${runLength}`,
    reason,
    params: { baseSize, runLength, threshold },
    interviews,
    baseCodes,
    newPerInterview,
    cumulative,
    steps,
  })

  if (interviews < baseSize + runLength)
    return result(
      'too-few-interviews',
      [],
      `Saturation needs at least ${plural(baseSize + runLength, 'interview')} (a base of ${baseSize} and a run of ${runLength}); ${plural(interviews, 'interview is', 'interviews are')} coded so far.`,
    )
  if (baseCodes === 0)
    return result('empty-base', [], `${firstInterviews(baseSize)} no codes yet, so there is nothing to compare new codes against.`)

  const steps: SaturationStep[] = []
  for (let start = baseSize; start + runLength <= interviews; start++) {
    const newCodes = cumulative[start + runLength - 1] - cumulative[start - 1]
    const ratio = newCodes / baseCodes
    steps.push({ from: start + 1, to: start + runLength, newCodes, ratio, meetsThreshold: ratio <= threshold })
  }
  const first = steps.find((step) => step.meetsThreshold)
  if (first) return result('reached', steps, null, first.from - 1)
  const last = steps[steps.length - 1]
  return result(
    'not-reached',
    steps,
    `No run of ${plural(runLength, 'interview')} has met the ${percent(threshold)} threshold yet; the last run (interviews ${last.from}–${last.to}) added ${percent(last.ratio)} new codes.`,
  )
}

/** 0.027027 → "2.7%", 0.05 → "5%". */
function percent(share: number): string {
  return `${Number((share * 100).toFixed(1))}%`
}

const NUMBER_WORDS = ['zero', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten']
const ORDINAL_WORDS = ['zeroth', 'first', 'second', 'third', 'fourth', 'fifth', 'sixth', 'seventh', 'eighth', 'ninth', 'tenth',
  'eleventh', 'twelfth', 'thirteenth', 'fourteenth', 'fifteenth', 'sixteenth', 'seventeenth', 'eighteenth', 'nineteenth', 'twentieth']

function ordinal(n: number): string {
  if (n < ORDINAL_WORDS.length) return ORDINAL_WORDS[n]
  const suffix = n % 100 >= 11 && n % 100 <= 13 ? 'th' : ({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th'
  return `${n}${suffix}`
}

/**
 * A sentence a team can adapt for the methods section, citing Guest, Namey & Chen (2020). It reads the
 * parameters from `result` unless others are given.
 */
export function methodsSentence(result: SaturationResult, params: SaturationParams = result.params): string {
  const { baseSize, runLength, threshold } = params
  const opening = `Using the approach of Guest, Namey & Chen (2020) with a base of ${plural(baseSize, 'interview')}, runs of ${runLength} and a new-information threshold of ${percent(threshold)}`
  const base = `relative to the ${plural(result.baseCodes, 'code')} in the base`
  switch (result.status) {
    case 'reached': {
      const step = result.steps.find((s) => s.meetsThreshold) as SaturationStep
      const run = runLength === 1 ? 'the interview' : `the ${NUMBER_WORDS[runLength] ?? runLength} interviews`
      const added = step.newCodes === 0 ? `added no new codes (0% ${base})` : `added ${percent(step.ratio)} new codes ${base}`
      return `${opening}, saturation was reached at ${result.label}: ${run} after the ${ordinal(result.saturationAt ?? 0)} ${added}.`
    }
    case 'not-reached': {
      const last = result.steps[result.steps.length - 1]
      return `${opening}, saturation was not reached in the ${plural(result.interviews, 'interview')} analysed: the last run (interviews ${last.from}–${last.to}) added ${percent(last.ratio)} new codes ${base}.`
    }
    case 'too-few-interviews':
      return `${opening}, saturation could not yet be assessed: it needs at least ${plural(baseSize + runLength, 'interview')} and ${result.interviews} ${result.interviews === 1 ? 'has' : 'have'} been analysed.`
    case 'empty-base':
      return `${opening}, saturation could not be assessed because ${baseSize === 1 ? 'the first interview' : `the first ${baseSize} interviews`} had no codes.`
  }
}
