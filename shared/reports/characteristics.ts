import type { Cell, CharacteristicsReport } from '../schemas/reports.js'

/** One participant characteristic as the study defines it (key, label and its values in order). */
export interface CharacteristicDefinition {
  key: string
  label: string
  values: { value: string; label: string }[]
}

export interface CharacteristicsInput {
  characteristics: CharacteristicDefinition[]
  /** each interviewed participant's characteristics (key → value) */
  interviewed: Record<string, string>[]
  /** each consented participant's characteristics (key → value) */
  consented: Record<string, string>[]
  /** counts from 1 to minCell − 1 are suppressed; 1 suppresses nothing */
  minCell: number
  /** interview durations in minutes */
  durations: number[]
  /** characteristics chosen to label quotes */
  quoteLabelKeys: string[]
}

export type DurationSummary = NonNullable<CharacteristicsReport['duration']>

export const NOT_REPORTED_LABEL = 'Not reported'

export const ROUNDING_RULE =
  'Percentages are of all interviewed (or consented) participants, rounded half up to one decimal place, so a column may not add up to exactly 100.'

export function suppressionRule(minCell: number): string {
  if (minCell <= 1) return 'No counts are hidden: every count is shown.'
  return (
    `Counts from 1 to ${minCell - 1} are hidden (shown as "<${minCell}") so that small groups of participants cannot be recognised; ` +
    'zero counts are shown, as they identify no one. When only one count in a characteristic is hidden, the next-smallest ' +
    'count in that characteristic is hidden too, so the hidden count cannot be worked out from the total.'
  )
}

/**
 * Percentage of `count` in `total`, rounded half up to one decimal place. Counts are whole numbers,
 * so the rounding is done on integers (10·percent = round(1000·count / total)) to avoid binary
 * fractions such as 12.499999… turning 12.5 into 12.4.
 */
export function percentOf(count: number, total: number): number {
  if (total <= 0) return 0
  return Math.floor((2000 * count + total) / (2 * total)) / 10
}

/** Round half up to one decimal place; exponent notation keeps 2.25 from becoming 2.2 through binary error. */
export function roundOne(value: number): number {
  return Number(`${Math.round(Number(`${value}e1`))}e-1`)
}

/** n, mean (one decimal), median, min and max of the minutes; null when there are none. */
export function durationSummary(minutes: readonly number[]): DurationSummary | null {
  const sorted = minutes.filter((m) => Number.isFinite(m)).sort((a, b) => a - b)
  const n = sorted.length
  if (n === 0) return null
  const sum = sorted.reduce((s, m) => s + m, 0)
  const middle = Math.floor(n / 2)
  const median = n % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2
  return { n, mean: roundOne(sum / n), median: roundOne(median), min: sorted[0]!, max: sorted[n - 1]! }
}

/** Counts per row (defined values in order, then not reported) for one characteristic. */
function countValues(definition: CharacteristicDefinition, people: readonly Record<string, string>[]): number[] {
  const index = new Map(definition.values.map((v, i) => [v.value, i]))
  const counts: number[] = Array.from({ length: definition.values.length + 1 }, () => 0)
  for (const person of people) {
    const at = index.get(person[definition.key] ?? '') ?? definition.values.length
    counts[at]! += 1
  }
  return counts
}

/** Cells for one column of one characteristic, with primary and complementary suppression. */
function columnCells(counts: readonly number[], total: number, minCell: number): Cell[] {
  const hidden = counts.map((c) => c > 0 && c < minCell)
  if (hidden.filter(Boolean).length === 1) {
    // complementary suppression: hide the next-smallest nonzero count (first in row order on a tie)
    let pick = -1
    counts.forEach((c, i) => {
      if (!hidden[i] && c > 0 && (pick === -1 || c < counts[pick]!)) pick = i
    })
    if (pick !== -1) hidden[pick] = true
  }
  return counts.map((count, i) => (hidden[i] ? { count: null, percent: null, suppressed: true } : { count, percent: percentOf(count, total), suppressed: false }))
}

function comboKey(person: Record<string, string>, keys: readonly string[]): string {
  return JSON.stringify(keys.map((k) => person[k] ?? ''))
}

/** Interviewed participants whose combination of the quote-label characteristics is theirs alone. */
export function groupsOfOne(people: readonly Record<string, string>[], keys: readonly string[]): number {
  if (keys.length === 0) return 0
  const sizes = new Map<string, number>()
  for (const p of people) sizes.set(comboKey(p, keys), (sizes.get(comboKey(p, keys)) ?? 0) + 1)
  return [...sizes.values()].filter((size) => size === 1).length
}

/** The participant characteristics table: counts and percentages of interviewed and consented participants. */
export function characteristicsTable(input: CharacteristicsInput): CharacteristicsReport {
  const minCell = Math.max(1, Math.floor(input.minCell))
  const totals = { interviewed: input.interviewed.length, consented: input.consented.length }
  const groups = input.characteristics.map((definition) => {
    const interviewed = columnCells(countValues(definition, input.interviewed), totals.interviewed, minCell)
    const consented = columnCells(countValues(definition, input.consented), totals.consented, minCell)
    const labels = [...definition.values, { value: '', label: NOT_REPORTED_LABEL }]
    return {
      key: definition.key,
      label: definition.label,
      rows: labels.map((v, i) => ({ value: v.value, label: v.label, interviewed: interviewed[i]!, consented: consented[i]! })),
    }
  })
  const single = groupsOfOne(input.interviewed, input.quoteLabelKeys)
  const labelOf = new Map(input.characteristics.map((c) => [c.key, c.label]))
  return {
    minCell,
    roundingRule: ROUNDING_RULE,
    suppressionRule: suppressionRule(minCell),
    totals,
    groups,
    duration: durationSummary(input.durations),
    quoteLabelWarning: single > 0 ? { characteristics: input.quoteLabelKeys.map((k) => labelOf.get(k) ?? k), groupsOfOne: single } : null,
  }
}
