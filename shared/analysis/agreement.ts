/**
 * Inter-coder agreement: percent agreement, Cohen's kappa (Cohen 1960), Fleiss' kappa (Fleiss 1971) and
 * Krippendorff's alpha (Krippendorff 2011). Pure functions; nothing is rounded. Where a coefficient is not
 * defined they throw {@link AgreementUndefinedError} (never return NaN); {@link tryAgreement} turns that into a value.
 */

export type AgreementReason =
  | 'unequal-lengths'
  | 'no-units'
  | 'no-pairable-values'
  | 'no-variation'
  | 'inconsistent-raters'
  | 'non-numeric'
  | 'invalid-input'

/** A coefficient that is not defined for this input; `message` is plain English a screen can show. */
export class AgreementUndefinedError extends Error {
  readonly reason: AgreementReason
  constructor(reason: AgreementReason, message: string) {
    super(message)
    this.name = 'AgreementUndefinedError'
    this.reason = reason
  }
}

export type AgreementOutcome = { value: number } | { undefined: AgreementReason; message: string }

/** Runs `compute` and returns `{ value }`, or `{ undefined: reason, message }` when agreement is not defined. */
export function tryAgreement(compute: () => number): AgreementOutcome {
  try {
    return { value: compute() }
  } catch (error) {
    if (error instanceof AgreementUndefinedError) return { undefined: error.reason, message: error.message }
    throw error
  }
}

export type Label = string | number

const fail = (reason: AgreementReason, message: string): never => {
  throw new AgreementUndefinedError(reason, message)
}
const NO_UNITS = 'There is nothing to compare yet: no unit has been coded.'
const NO_VARIATION =
  'Every unit was put in the same single category, so agreement beyond chance cannot be measured. Report percent agreement instead.'

function checkSameLength(a: ArrayLike<unknown>, b: ArrayLike<unknown>): void {
  if (a.length !== b.length) fail('unequal-lengths', `The two coders' lists differ in length (${a.length} and ${b.length}), so units cannot be matched.`)
}

function checkPair(a: readonly unknown[], b: readonly unknown[]): void {
  checkSameLength(a, b)
  if (a.length === 0) fail('no-units', NO_UNITS)
}

function checkCounts(values: readonly number[], what: string): void {
  for (const v of values) if (!(Number.isFinite(v) && v >= 0)) fail('invalid-input', `${what} must be counts of zero or more.`)
}

/**
 * Share of units (0–1) that two coders put in the same category. Labels are compared with `===`-like
 * equality (`1` and `'1'` differ). Throws `unequal-lengths` or `no-units`.
 */
export function percentAgreement(a: readonly Label[], b: readonly Label[]): number {
  checkPair(a, b)
  let same = 0
  for (let i = 0; i < a.length; i++) if (a[i] === b[i]) same++
  return same / a.length
}

export interface CohensKappaDetail {
  units: number
  /** observed agreement p_o */
  po: number
  /** chance agreement p_e = Σ_k (row_k/N)(col_k/N) */
  pe: number
  kappa: number
}

/**
 * Cohen's kappa from a square table of counts: rows coder A's categories, columns coder B's, same order.
 * Throws `invalid-input` (not square, negative counts), `no-units` (all zero) or `no-variation` (p_e = 1).
 */
export function cohensKappaFromTable(table: readonly (readonly number[])[]): CohensKappaDetail {
  const k = table.length
  if (table.some((row) => row.length !== k)) fail('invalid-input', 'The agreement table must have as many columns as rows.')
  table.forEach((row) => checkCounts(row, 'Table cells'))
  const rows = new Array<number>(k).fill(0)
  const cols = new Array<number>(k).fill(0)
  let units = 0
  let diagonal = 0
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      rows[i] += table[i][j]
      cols[j] += table[i][j]
      units += table[i][j]
    }
    diagonal += table[i][i]
  }
  if (units === 0) fail('no-units', NO_UNITS)
  let pe = 0
  for (let i = 0; i < k; i++) pe += (rows[i] / units) * (cols[i] / units)
  const po = diagonal / units
  if (pe >= 1) fail('no-variation', NO_VARIATION)
  return { units, po, pe, kappa: (po - pe) / (1 - pe) }
}

/**
 * Cohen's kappa for two coders' labels on the same units (`a[i]` and `b[i]` describe unit i).
 * Runs in O(units + categories²). Throws `unequal-lengths`, `no-units` or `no-variation` (both coders used one
 * and the same category throughout).
 */
export function cohensKappa(a: readonly Label[], b: readonly Label[]): number {
  checkPair(a, b)
  const index = new Map<Label, number>()
  const codeOf = (label: Label): number => {
    let code = index.get(label)
    if (code === undefined) index.set(label, (code = index.size))
    return code
  }
  const codesA = Int32Array.from(a, codeOf)
  const codesB = Int32Array.from(b, codeOf)
  const table = Array.from({ length: index.size }, () => new Array<number>(index.size).fill(0))
  for (let i = 0; i < codesA.length; i++) table[codesA[i]][codesB[i]]++
  return cohensKappaFromTable(table).kappa
}

/** How often a code was applied by both coders, by one only, or by neither, over the same units. */
export interface BinaryCounts {
  both: number
  onlyA: number
  onlyB: number
  neither: number
}

/** Counts the four cells from two arrays of flags (truthy = the code applies to unit i). One pass, no strings. */
export function binaryCounts(a: ArrayLike<number | boolean>, b: ArrayLike<number | boolean>): BinaryCounts {
  checkSameLength(a, b)
  let both = 0
  let onlyA = 0
  let onlyB = 0
  for (let i = 0; i < a.length; i++) {
    if (a[i]) {
      if (b[i]) both++
      else onlyA++
    } else if (b[i]) onlyB++
  }
  return { both, onlyA, onlyB, neither: a.length - both - onlyA - onlyB }
}

export interface BinaryAgreement {
  units: number
  percentAgreement: number
  kappa: AgreementOutcome
  /** Krippendorff's alpha, nominal, two coders, no missing values */
  alpha: AgreementOutcome
}

/**
 * Agreement on one code (applied / not applied) from its four counts: the fast path for many codes over many
 * units, where the caller counts from sets of unit numbers. Throws `no-units` or `invalid-input`; a code that
 * neither coder (or each coder everywhere) applied gives `kappa`/`alpha` as `{ undefined: 'no-variation' }`.
 */
export function binaryAgreementFromCounts({ both, onlyA, onlyB, neither }: BinaryCounts): BinaryAgreement {
  checkCounts([both, onlyA, onlyB, neither], 'Binary counts')
  const units = both + onlyA + onlyB + neither
  if (units === 0) fail('no-units', NO_UNITS)
  const differ = onlyA + onlyB
  return {
    units,
    percentAgreement: (both + neither) / units,
    kappa: tryAgreement(() => cohensKappaFromTable([[both, onlyA], [onlyB, neither]]).kappa),
    alpha: tryAgreement(() => krippendorffAlphaFromCoincidences([[2 * neither, differ], [differ, 2 * both]], 'nominal').alpha),
  }
}

/** {@link binaryAgreementFromCounts} for two arrays of flags over the same units. */
export function binaryAgreement(a: ArrayLike<number | boolean>, b: ArrayLike<number | boolean>): BinaryAgreement {
  return binaryAgreementFromCounts(binaryCounts(a, b))
}

export interface FleissKappaDetail {
  subjects: number
  raters: number
  /** mean agreement over subjects, P̄ */
  pBar: number
  /** chance agreement, P̄_e = Σ_j p_j² */
  peBar: number
  kappa: number
  /** share of all ratings in each category, p_j */
  shares: number[]
  /** κ_j per category (Fleiss 1971); undefined where no rater, or every rater, used the category */
  perCategory: AgreementOutcome[]
}

/**
 * Fleiss' kappa with per-category values from a subjects × categories table: `counts[i][j]` raters put subject
 * i in category j, every row summing to the same number of raters (at least two). Throws `no-units`,
 * `invalid-input`, `inconsistent-raters`, `no-pairable-values` (one rater) or `no-variation` (P̄_e = 1).
 */
export function fleissKappaDetail(counts: readonly (readonly number[])[]): FleissKappaDetail {
  const subjects = counts.length
  if (subjects === 0) fail('no-units', NO_UNITS)
  const k = counts[0].length
  if (k === 0 || counts.some((row) => row.length !== k)) fail('invalid-input', 'Every subject needs a count for each category.')
  counts.forEach((row) => checkCounts(row, 'Rating counts'))
  const raters = counts[0].reduce((sum, v) => sum + v, 0)
  if (counts.some((row) => row.reduce((sum, v) => sum + v, 0) !== raters))
    fail('inconsistent-raters', 'Fleiss\' kappa needs the same number of raters for every subject.')
  if (raters < 2) fail('no-pairable-values', 'Agreement needs at least two raters per subject.')
  const totals = new Array<number>(k).fill(0)
  const disagreement = new Array<number>(k).fill(0)
  let pSum = 0
  for (const row of counts) {
    let squares = 0
    row.forEach((n, j) => {
      totals[j] += n
      disagreement[j] += n * (raters - n)
      squares += n * n
    })
    pSum += (squares - raters) / (raters * (raters - 1))
  }
  const shares = totals.map((t) => t / (subjects * raters))
  const pBar = pSum / subjects
  const peBar = shares.reduce((sum, p) => sum + p * p, 0)
  if (peBar >= 1) fail('no-variation', NO_VARIATION)
  const perCategory = shares.map((p, j) =>
    tryAgreement(() => {
      if (p === 0 || p === 1) fail('no-variation', 'No rater, or every rater, used this category, so its kappa is not defined.')
      return 1 - disagreement[j] / (subjects * raters * (raters - 1) * p * (1 - p))
    }),
  )
  return { subjects, raters, pBar, peBar, kappa: (pBar - peBar) / (1 - peBar), shares, perCategory }
}

/** Fleiss' kappa; see {@link fleissKappaDetail} for the input and the errors. */
export function fleissKappa(counts: readonly (readonly number[])[]): number {
  return fleissKappaDetail(counts).kappa
}

export type MeasurementLevel = 'nominal' | 'ordinal' | 'interval' | 'ratio'

export interface KrippendorffAlphaDetail {
  alpha: number
  /** D_o */
  observed: number
  /** D_e */
  expected: number
  /** n: values in units with at least two values */
  pairable: number
  /** the distinct values, in the order of `totals` and `coincidences` (ascending for numeric levels) */
  values: Label[]
  /** n_c, the marginal total of each value */
  totals: number[]
  coincidences: number[][]
}

/** Squared difference δ²(c, k) between value indices, per Krippendorff (2011). */
function differenceFunction(level: MeasurementLevel, values: readonly number[], totals: readonly number[]) {
  if (level === 'nominal') return (c: number, k: number) => (c === k ? 0 : 1)
  if (level === 'interval') return (c: number, k: number) => (values[c] - values[k]) ** 2
  if (level === 'ratio')
    return (c: number, k: number) => (values[c] + values[k] === 0 ? 0 : ((values[c] - values[k]) / (values[c] + values[k])) ** 2)
  const order = values.map((_, i) => i).sort((x, y) => values[x] - values[y])
  const rank = new Array<number>(values.length)
  const before = [0]
  order.forEach((index, r) => {
    rank[index] = r
    before.push(before[r] + totals[index])
  })
  return (c: number, k: number) => {
    const [low, high] = rank[c] <= rank[k] ? [rank[c], rank[k]] : [rank[k], rank[c]]
    return (before[high + 1] - before[low] - (totals[c] + totals[k]) / 2) ** 2
  }
}

/**
 * Krippendorff's alpha from a coincidence matrix (`o[c][k]`, symmetric). `values` gives the number each row
 * stands for and is required for ordinal, interval and ratio. Throws `invalid-input`, `non-numeric`,
 * `no-pairable-values` (n < 2) or `no-variation` (D_e = 0: alpha is undefined, not 1).
 */
export function krippendorffAlphaFromCoincidences(
  coincidences: readonly (readonly number[])[],
  level: MeasurementLevel,
  values: readonly number[] = [],
): Omit<KrippendorffAlphaDetail, 'values'> {
  const k = coincidences.length
  if (coincidences.some((row) => row.length !== k)) fail('invalid-input', 'The coincidence matrix must be square.')
  coincidences.forEach((row) => checkCounts(row, 'Coincidences'))
  if (level !== 'nominal' && (values.length !== k || values.some((v) => typeof v !== 'number' || !Number.isFinite(v))))
    fail('non-numeric', `${level[0].toUpperCase()}${level.slice(1)} agreement needs a number for every value coded.`)
  if (level === 'ratio' && values.some((v) => v < 0)) fail('invalid-input', 'Ratio agreement needs values of zero or more.')
  const totals = coincidences.map((row) => row.reduce((sum, v) => sum + v, 0))
  const n = totals.reduce((sum, v) => sum + v, 0)
  if (n < 2) fail('no-pairable-values', 'Agreement needs at least one unit coded by two or more coders.')
  const delta = differenceFunction(level, values, totals)
  let observed = 0
  let expected = 0
  for (let c = 0; c < k; c++)
    for (let j = 0; j < k; j++) {
      const d = delta(c, j)
      observed += coincidences[c][j] * d
      expected += totals[c] * totals[j] * d
    }
  observed /= n
  expected /= n * (n - 1)
  if (!(expected > 0)) fail('no-variation', NO_VARIATION)
  return { alpha: 1 - observed / expected, observed, expected, pairable: n, totals, coincidences: coincidences.map((row) => [...row]) }
}

/**
 * Krippendorff's alpha with its intermediates. `data` is coders × units (`data[coder][unit]`, `null` = not coded),
 * any number of coders; a unit with m ≥ 2 values adds 1/(m−1) per ordered pair of them to the coincidence matrix
 * and a unit with fewer values drops out. Ordinal, interval and ratio need numbers (ordinal ranks follow their
 * numeric order). Throws `no-units`, `unequal-lengths`, `non-numeric`, `no-pairable-values` or `no-variation`.
 * Runs in O(units × coders² + values²).
 */
export function krippendorffAlphaDetail(data: readonly (readonly (Label | null)[])[], level: MeasurementLevel): KrippendorffAlphaDetail {
  const units = data[0]?.length ?? 0
  if (units === 0) fail('no-units', NO_UNITS)
  if (data.some((row) => row.length !== units)) fail('unequal-lengths', 'Every coder needs an entry (or a blank) for every unit.')
  const seen = new Set<Label>()
  for (const row of data) for (const v of row) if (v !== null) seen.add(v)
  let values = [...seen]
  if (level !== 'nominal') {
    if (values.some((v) => typeof v !== 'number' || !Number.isFinite(v)))
      fail('non-numeric', `${level[0].toUpperCase()}${level.slice(1)} agreement needs numbers; use nominal for categories.`)
    values = (values as number[]).sort((x, y) => x - y)
  }
  const index = new Map(values.map((v, i) => [v, i]))
  const o = Array.from({ length: values.length }, () => new Array<number>(values.length).fill(0))
  const present: number[] = []
  for (let u = 0; u < units; u++) {
    present.length = 0
    for (const row of data) if (row[u] !== null) present.push(index.get(row[u] as Label) as number)
    const m = present.length
    if (m < 2) continue
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) if (i !== j) o[present[i]][present[j]] += 1 / (m - 1)
  }
  const numeric = level === 'nominal' ? [] : (values as number[])
  return { ...krippendorffAlphaFromCoincidences(o, level, numeric), values }
}

/** Krippendorff's alpha; see {@link krippendorffAlphaDetail} for the input and the errors. */
export function krippendorffAlpha(data: readonly (readonly (Label | null)[])[], level: MeasurementLevel): number {
  return krippendorffAlphaDetail(data, level).alpha
}
