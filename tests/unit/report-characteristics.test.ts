import { describe, expect, it } from 'vitest'
import { characteristicsTable, durationSummary, groupsOfOne, percentOf, roundOne, type CharacteristicsInput } from '../../shared/reports/characteristics.js'
import { characteristicsReport, type CharacteristicsReport } from '../../shared/schemas/reports.js'

/*
 * Invented fixture from the demo scenario (family caregivers after a relative's stroke).
 * Interviewed (7):
 *   I1 coast spouse · I2 coast spouse · I3 coast child · I4 rural spouse · I5 rural spouse · I6 urban child · I7 (no region) spouse
 *   region: coast 3, rural 2, urban 1, not reported 1     relationship: spouse 5, child 2, not reported 0
 * Consented (12) = the 7 interviewed and C8 coast spouse · C9 coast spouse · C10 coast child · C11 rural spouse · C12 rural 'friend'
 *   region: coast 6, rural 4, urban 1, not reported 1     relationship: spouse 8, child 3, not reported 1 ('friend' is not a defined value)
 */
const characteristics: CharacteristicsInput['characteristics'] = [
  {
    key: 'region',
    label: 'Region',
    values: [
      { value: 'coast', label: 'Coast' },
      { value: 'rural', label: 'Rural inland' },
      { value: 'urban', label: 'City' },
    ],
  },
  {
    key: 'relationship',
    label: 'Relationship to the person who had the stroke',
    values: [
      { value: 'spouse', label: 'Spouse or partner' },
      { value: 'child', label: 'Adult child' },
    ],
  },
]
const person = (region: string | null, relationship: string): Record<string, string> => (region === null ? { relationship } : { region, relationship })
const interviewed = [
  person('coast', 'spouse'),
  person('coast', 'spouse'),
  person('coast', 'child'),
  person('rural', 'spouse'),
  person('rural', 'spouse'),
  person('urban', 'child'),
  person(null, 'spouse'),
]
const consented = [...interviewed, person('coast', 'spouse'), person('coast', 'spouse'), person('coast', 'child'), person('rural', 'spouse'), person('rural', 'friend')]
const build = (overrides: Partial<CharacteristicsInput> = {}) =>
  characteristicsReport.parse(characteristicsTable({ characteristics, interviewed, consented, minCell: 1, durations: [], quoteLabelKeys: [], ...overrides }))

type Column = 'interviewed' | 'consented'
/** [count, percent] per row, with 'hidden' for a suppressed cell. */
const column = (report: CharacteristicsReport, key: string, col: Column) =>
  report.groups.find((g) => g.key === key)!.rows.map((r) => (r[col].suppressed ? 'hidden' : [r[col].count, r[col].percent]))

describe('percentages (rounded half up to one decimal place: common practice)', () => {
  it('rounds exact halves up and repeating decimals to the nearest tenth', () => {
    expect(percentOf(1, 8)).toBe(12.5) // 1/8 = 12.5% exactly
    expect(percentOf(1, 6)).toBe(16.7) // 1/6 = 16.666…%
    expect(percentOf(2, 3)).toBe(66.7) // 2/3 = 66.666…%
    expect(percentOf(1, 3)).toBe(33.3) // 1/3 = 33.333…%
    expect(percentOf(1, 16)).toBe(6.3) // 1/16 = 6.25% → half up 6.3
    // 23/80 = 28.75% → 28.8; computing 23/80*100*10 in floating point gives 287.4999…, which rounds to 28.7
    expect(percentOf(23, 80)).toBe(28.8)
    expect(percentOf(7, 7)).toBe(100)
    expect(percentOf(0, 7)).toBe(0)
    expect(percentOf(0, 0)).toBe(0)
  })

  it('rounds other values half up without binary error', () => {
    expect(roundOne(46.75)).toBe(46.8) // 187/4
    expect(roundOne(1.15)).toBe(1.2) // 1.15*10 is 11.4999… in floating point
    expect(roundOne(2.04)).toBe(2)
  })
})

describe('characteristicsTable with minCell 1 (nothing suppressed)', () => {
  const report = build()

  it('lists the defined values in order, then "Not reported", with counts and percentages of each column', () => {
    expect(report.totals).toEqual({ interviewed: 7, consented: 12 })
    const region = report.groups[0]!
    expect(region.rows.map((r) => [r.value, r.label])).toEqual([
      ['coast', 'Coast'],
      ['rural', 'Rural inland'],
      ['urban', 'City'],
      ['', 'Not reported'],
    ])
    // 3/7 = 42.857 → 42.9, 2/7 = 28.571 → 28.6, 1/7 = 14.286 → 14.3 (the column adds up to 100.1)
    expect(column(report, 'region', 'interviewed')).toEqual([[3, 42.9], [2, 28.6], [1, 14.3], [1, 14.3]])
    // 6/12 = 50.0, 4/12 = 33.33 → 33.3, 1/12 = 8.33 → 8.3
    expect(column(report, 'region', 'consented')).toEqual([[6, 50], [4, 33.3], [1, 8.3], [1, 8.3]])
    // 5/7 = 71.43 → 71.4, 2/7 → 28.6; nobody without a relationship: 0 (0%)
    expect(column(report, 'relationship', 'interviewed')).toEqual([[5, 71.4], [2, 28.6], [0, 0]])
    // an undefined value ('friend') counts as not reported: 8/12 = 66.7, 3/12 = 25.0, 1/12 = 8.3
    expect(column(report, 'relationship', 'consented')).toEqual([[8, 66.7], [3, 25], [1, 8.3]])
  })

  it('states the rules in plain words', () => {
    expect(report.roundingRule).toMatch(/rounded half up to one decimal place/)
    expect(report.suppressionRule).toMatch(/No counts are hidden/)
    expect(report.minCell).toBe(1)
  })
})

// Small-count suppression is statistical disclosure control (common practice; from memory, many
// statistical offices hide counts below a threshold of about 5 or 10, and hide a second cell when one
// hidden cell could be worked out from the total).
describe('characteristicsTable with minCell 3', () => {
  const report = build({ minCell: 3 })

  it('hides counts from 1 to 2 and shows zeros', () => {
    // interviewed region: coast 3 shown; rural 2, urban 1, not reported 1 hidden (three hidden, no complement needed)
    expect(column(report, 'region', 'interviewed')).toEqual([[3, 42.9], 'hidden', 'hidden', 'hidden'])
    // consented region: urban 1 and not reported 1 hidden; two hidden cells, so rural 4 stays
    expect(column(report, 'region', 'consented')).toEqual([[6, 50], [4, 33.3], 'hidden', 'hidden'])
    const hidden = report.groups[0]!.rows[1]!.interviewed
    expect(hidden).toEqual({ count: null, percent: null, suppressed: true })
  })

  it('hides the next-smallest nonzero cell when only one cell of a group is hidden', () => {
    // interviewed relationship: child 2 is the only small cell; else 7 − 5 = 2 would give it away, so spouse 5 is hidden too; the 0 stays
    expect(column(report, 'relationship', 'interviewed')).toEqual(['hidden', 'hidden', [0, 0]])
    // consented relationship: not reported 1 is the only small cell; the next smallest nonzero is child 3 (not spouse 8)
    expect(column(report, 'relationship', 'consented')).toEqual([[8, 66.7], 'hidden', 'hidden'])
    expect(report.suppressionRule).toMatch(/from 1 to 2/)
    expect(report.suppressionRule).toMatch(/next-smallest/)
  })

  it('never leaves exactly one hidden nonzero cell in a group, for any threshold', () => {
    for (let minCell = 1; minCell <= 8; minCell++) {
      const r = build({ minCell })
      for (const g of r.groups) {
        for (const col of ['interviewed', 'consented'] as const) {
          const count = g.rows.filter((row) => row[col].suppressed).length
          expect(count === 1, `${g.key} ${col} minCell ${minCell}`).toBe(false)
        }
      }
    }
  })

  it('hides the first of two equal next-smallest cells in row order (our tie rule)', () => {
    const defs = [{ key: 'k', label: 'K', values: ['a', 'b', 'c'].map((v) => ({ value: v, label: v })) }]
    const people = [...Array(4).fill({ k: 'a' }), ...Array(4).fill({ k: 'b' }), { k: 'c' }] as Record<string, string>[]
    const r = characteristicsTable({ characteristics: defs, interviewed: people, consented: people, minCell: 2, durations: [], quoteLabelKeys: [] })
    expect(column(r, 'k', 'interviewed')).toEqual(['hidden', [4, 44.4], 'hidden', [0, 0]]) // 4/9 = 44.44 → 44.4
  })
})

describe('durationSummary', () => {
  it('gives the middle value for an odd count', () => {
    // 30, 45, 60 → mean 135/3 = 45, median 45
    expect(durationSummary([60, 30, 45])).toEqual({ n: 3, mean: 45, median: 45, min: 30, max: 60 })
  })
  it('averages the two middle values for an even count and rounds the mean half up', () => {
    // 30, 40, 55, 62 → mean 187/4 = 46.75 → 46.8; median (40 + 55)/2 = 47.5
    expect(durationSummary([55, 30, 62, 40])).toEqual({ n: 4, mean: 46.8, median: 47.5, min: 30, max: 62 })
  })
  it('is null when no interview has a length', () => {
    expect(durationSummary([])).toBeNull()
    expect(build().duration).toBeNull()
  })
  it('appears in the table', () => {
    expect(build({ durations: [42] }).duration).toEqual({ n: 1, mean: 42, median: 42, min: 42, max: 42 })
  })
})

describe('quote label warning', () => {
  it('counts interviewed participants alone in their combination of characteristics', () => {
    // combinations: coast+spouse 2, coast+child 1, rural+spouse 2, urban+child 1, (none)+spouse 1 → 3 groups of one
    expect(groupsOfOne(interviewed, ['region', 'relationship'])).toBe(3)
    expect(build({ quoteLabelKeys: ['region', 'relationship'] }).quoteLabelWarning).toEqual({
      characteristics: ['Region', 'Relationship to the person who had the stroke'],
      groupsOfOne: 3,
    })
    // region alone: coast 3, rural 2, urban 1, not reported 1 → 2 groups of one
    expect(build({ quoteLabelKeys: ['region'] }).quoteLabelWarning).toEqual({ characteristics: ['Region'], groupsOfOne: 2 })
  })
  it('is null when no group has one person or no characteristic labels quotes', () => {
    // relationship alone: spouse 5, child 2
    expect(build({ quoteLabelKeys: ['relationship'] }).quoteLabelWarning).toBeNull()
    expect(build({ quoteLabelKeys: [] }).quoteLabelWarning).toBeNull()
  })
})

describe('an empty study', () => {
  it('shows zero rows and no NaN', () => {
    const r = characteristicsTable({ characteristics, interviewed: [], consented: [], minCell: 5, durations: [], quoteLabelKeys: ['region'] })
    expect(r.totals).toEqual({ interviewed: 0, consented: 0 })
    expect(column(r, 'region', 'interviewed')).toEqual([[0, 0], [0, 0], [0, 0], [0, 0]])
    expect(r.quoteLabelWarning).toBeNull()
    expect(JSON.stringify(r)).not.toMatch(/NaN/)
  })
})
