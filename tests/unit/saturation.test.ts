import { describe, expect, it } from 'vitest'
import { assessSaturation, DEFAULT_SATURATION, methodsSentence, SaturationParamsError } from '../../shared/analysis/saturation.js'

/** Interviews that add exactly `newPerInterview[i]` codes each, numbered c1, c2, … in order of first use. */
function interviewsAdding(newPerInterview: number[], repeatEarlier = true): string[][] {
  let next = 1
  return newPerInterview.map((count, i) => {
    const codes = Array.from({ length: count }, () => `c${next++}`)
    // Earlier codes come up again; they must not count as new.
    return repeatEarlier && i > 0 ? ['c1', 'c2', ...codes, 'c1'] : codes
  })
}

// Guest, Namey & Chen (2020), PLOS ONE 15(5): e0232076 — a fixture constructed to reproduce the paper's published ratios (derived)
// to reproduce the paper's published ratios (base of 4 with 37 codes; runs adding 7, 4 and 1); the per-interview
// split is ours, not the paper's.
const FIXTURE = interviewsAdding([20, 9, 5, 3, 4, 3, 2, 2, 1, 0, 0, 0])

describe('saturation on the published worked example', () => {
  it('counts new and cumulative codes per interview, and 37 codes in the base of 4', () => {
    // Guest, Namey & Chen (2020): base of 4 interviews with 37 unique codes (published).
    const result = assessSaturation(FIXTURE, { baseSize: 4, runLength: 2, threshold: 0.05 })
    expect(result.baseCodes).toBe(37)
    expect(result.newPerInterview).toEqual([20, 9, 5, 3, 4, 3, 2, 2, 1, 0, 0, 0])
    expect(result.cumulative).toEqual([20, 29, 34, 37, 41, 44, 46, 48, 49, 49, 49, 49])
  })

  it('gives the published ratios 7/37, 4/37 and 1/37, the base staying the denominator', () => {
    // Guest, Namey & Chen (2020): first run (interviews 5–6) added 7 → 19%; a later run 4 → 11%; a final run 1 → below 5%.
    const { steps } = assessSaturation(FIXTURE, DEFAULT_SATURATION)
    expect(steps.slice(0, 5)).toEqual([
      { from: 5, to: 6, newCodes: 7, ratio: 7 / 37, meetsThreshold: false },
      { from: 6, to: 7, newCodes: 5, ratio: 5 / 37, meetsThreshold: false },
      { from: 7, to: 8, newCodes: 4, ratio: 4 / 37, meetsThreshold: false },
      { from: 8, to: 9, newCodes: 3, ratio: 3 / 37, meetsThreshold: false },
      { from: 9, to: 10, newCodes: 1, ratio: 1 / 37, meetsThreshold: true },
    ])
    expect(Math.round(steps[0].ratio * 100)).toBe(19)
    expect(Math.round(steps[2].ratio * 100)).toBe(11)
    expect(steps[4].ratio).toBeCloseTo(0.027, 3)
  })

  it('reaches saturation at 8+2 with a 5% threshold', () => {
    // Guest, Namey & Chen (2020), fixture constructed to reproduce the published ratios (derived): saturation "8+2", saturationAt 8.
    const result = assessSaturation(FIXTURE, { baseSize: 4, runLength: 2, threshold: 0.05 })
    expect(result).toMatchObject({ status: 'reached', reached: true, saturationAt: 8, label: '8+2', reason: null })
  })

  it('reaches saturation at 9+2 with the strict threshold of 0', () => {
    // Guest, Namey & Chen (2020), fixture constructed to reproduce the published ratios (derived): with threshold 0, "9+2".
    const result = assessSaturation(FIXTURE, { baseSize: 4, runLength: 2, threshold: 0 })
    expect(result).toMatchObject({ reached: true, saturationAt: 9, label: '9+2' })
    expect(result.steps.filter((step) => step.meetsThreshold).map((step) => step.from)).toEqual([10, 11])
  })

  it('takes the paper\'s defaults: base 4, runs of 2, threshold 5%', () => {
    // Guest, Namey & Chen (2020): base of 4, run of 2 or 3, threshold ≤ 5%.
    expect(DEFAULT_SATURATION).toEqual({ baseSize: 4, runLength: 2, threshold: 0.05 })
    expect(assessSaturation(FIXTURE).label).toBe('8+2')
  })

  it('reports runs of 3 as X+3', () => {
    // Same fixture, run length 3 (derived): 9–11 adds 1 of 37 → 2.7% → "8+3".
    const result = assessSaturation(FIXTURE, { runLength: 3 })
    expect(result.steps[0]).toMatchObject({ from: 5, to: 7, newCodes: 9 })
    expect(result.label).toBe('8+3')
  })

  it('counts a run exactly at the threshold as saturated', () => {
    // Guest, Namey & Chen (2020): saturated when the ratio is at or below the threshold. 2 of 40 is exactly 5%.
    const result = assessSaturation(interviewsAdding([10, 10, 10, 10, 1, 1]), { threshold: 0.05 })
    expect(result.steps).toEqual([{ from: 5, to: 6, newCodes: 2, ratio: 0.05, meetsThreshold: true }])
    expect(result.label).toBe('4+2')
  })

  it('counts a code repeated within one interview once', () => {
    const result = assessSaturation([['a', 'a', 'b'], ['b', 'c', 'c'], [1, '1']], { baseSize: 1, runLength: 1, threshold: 0 })
    expect(result.newPerInterview).toEqual([2, 1, 2])
  })
})

describe('saturation not reached or not assessable', () => {
  it('reports not reached with the last run when no run meets the threshold', () => {
    const result = assessSaturation(interviewsAdding([20, 9, 5, 3, 4, 3, 2, 2]))
    expect(result).toMatchObject({ status: 'not-reached', reached: false, saturationAt: null, label: null })
    expect(result.steps.map((step) => step.newCodes)).toEqual([7, 5, 4])
    expect(result.reason).toBe('No run of 2 interviews has met the 5% threshold yet; the last run (interviews 7–8) added 10.8% new codes.')
  })

  it('says how many interviews are still needed when there are fewer than base + run', () => {
    const result = assessSaturation(interviewsAdding([20, 9, 5]))
    expect(result).toMatchObject({ status: 'too-few-interviews', reached: false, saturationAt: null, label: null, steps: [] })
    expect(result.newPerInterview).toEqual([20, 9, 5])
    expect(result.reason).toBe('Saturation needs at least 6 interviews (a base of 4 and a run of 2); 3 interviews are coded so far.')
    expect(assessSaturation([]).reason).toMatch(/0 interviews are coded/)
  })

  it('says so when the base has no codes, instead of dividing by zero', () => {
    const result = assessSaturation([[], [], [], [], ['a'], []])
    expect(result).toMatchObject({ status: 'empty-base', reached: false, baseCodes: 0, steps: [] })
    expect(result.reason).toMatch(/^The first 4 interviews have no codes yet/)
  })

  it.each([
    [{ baseSize: 0 }, 'baseSize'],
    [{ baseSize: 2.5 }, 'baseSize'],
    [{ runLength: 0 }, 'runLength'],
    [{ threshold: -0.01 }, 'threshold'],
    [{ threshold: 1.5 }, 'threshold'],
    [{ threshold: Number.NaN }, 'threshold'],
  ])('refuses invalid parameters %o', (params, field) => {
    expect(() => assessSaturation(FIXTURE, params)).toThrow(SaturationParamsError)
    try {
      assessSaturation(FIXTURE, params)
    } catch (error) {
      expect((error as SaturationParamsError).field).toBe(field)
    }
  })
})

describe('methods sentence', () => {
  it('describes saturation reached at 8+2 with the paper\'s citation', () => {
    const result = assessSaturation(FIXTURE)
    expect(methodsSentence(result, DEFAULT_SATURATION)).toBe(
      'Using the approach of Guest, Namey & Chen (2020) with a base of 4 interviews, runs of 2 and a new-information ' +
        'threshold of 5%, saturation was reached at 8+2: the two interviews after the eighth added 2.7% new codes ' +
        'relative to the 37 codes in the base.',
    )
  })

  it('says "no new codes" for the strict threshold', () => {
    const result = assessSaturation(FIXTURE, { threshold: 0 })
    expect(methodsSentence(result)).toMatch(/threshold of 0%, saturation was reached at 9\+2: the two interviews after the ninth added no new codes/)
  })

  it('describes saturation not reached', () => {
    const result = assessSaturation(interviewsAdding([20, 9, 5, 3, 4, 3, 2, 2]))
    expect(methodsSentence(result)).toBe(
      'Using the approach of Guest, Namey & Chen (2020) with a base of 4 interviews, runs of 2 and a new-information ' +
        'threshold of 5%, saturation was not reached in the 8 interviews analysed: the last run (interviews 7–8) ' +
        'added 10.8% new codes relative to the 37 codes in the base.',
    )
  })

  it('describes too few interviews and an empty base', () => {
    expect(methodsSentence(assessSaturation(interviewsAdding([3])))).toMatch(/could not yet be assessed: it needs at least 6 interviews and 1 has been analysed\.$/)
    expect(methodsSentence(assessSaturation([[], [], [], [], [], []]))).toMatch(/could not be assessed because the first 4 interviews had no codes\.$/)
  })
})
