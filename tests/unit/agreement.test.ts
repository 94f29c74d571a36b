import { describe, expect, it } from 'vitest'
import {
  AgreementUndefinedError,
  binaryAgreement,
  binaryAgreementFromCounts,
  binaryCounts,
  cohensKappa,
  cohensKappaFromTable,
  fleissKappa,
  fleissKappaDetail,
  krippendorffAlpha,
  krippendorffAlphaDetail,
  percentAgreement,
  tryAgreement,
  type Label,
  type MeasurementLevel,
} from '../../shared/analysis/agreement.js'

/** Expands a table of counts (rows coder A, columns coder B) into two label lists, unit by unit. */
function labelsFromTable(table: number[][], names: Label[]): [Label[], Label[]] {
  const a: Label[] = []
  const b: Label[] = []
  table.forEach((row, i) => row.forEach((count, j) => {
    for (let n = 0; n < count; n++) {
      a.push(names[i])
      b.push(names[j])
    }
  }))
  return [a, b]
}

/** The reason an agreement function gives for being undefined, or 'defined'. */
function reasonOf(compute: () => unknown): string {
  try {
    compute()
    return 'defined'
  } catch (error) {
    if (error instanceof AgreementUndefinedError) return error.reason
    throw error
  }
}

/** A small seeded generator (linear congruential, Numerical Recipes constants; common practice). */
function seededRandom(seed: number): () => number {
  let state = seed >>> 0
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return state / 2 ** 32
  }
}

const _ = null
// Krippendorff (2011), "Computing Krippendorff's Alpha-Reliability", the 4 coders × 12 units example with missing values.
const FOUR_CODERS = [
  [1, 2, 3, 3, 2, 1, 4, 1, 2, _, _, _],
  [1, 2, 3, 3, 2, 2, 4, 1, 2, 5, _, 3],
  [_, 3, 3, 3, 2, 3, 4, 2, 2, 5, 1, _],
  [1, 2, 3, 3, 2, 4, 4, 1, 2, 5, 1, _],
]
// Krippendorff (2011), the binary example: 2 coders × 10 units.
const BINARY_A = [0, 1, 0, 0, 0, 0, 0, 0, 1, 0]
const BINARY_B = [1, 1, 1, 0, 0, 1, 0, 0, 0, 0]
// Wikipedia, "Fleiss' kappa" worked example; Cardillo (2007): 10 subjects × 14 raters × 5 categories.
const FLEISS_TABLE = [
  [0, 0, 0, 0, 14], [0, 2, 6, 4, 2], [0, 0, 3, 5, 6], [0, 3, 9, 2, 0], [2, 2, 8, 1, 1],
  [7, 7, 0, 0, 0], [3, 2, 6, 3, 0], [2, 5, 3, 2, 2], [6, 5, 2, 1, 0], [0, 2, 2, 3, 7],
]

describe("Cohen's kappa on published examples", () => {
  it('gives p_o 0.70, p_e 0.50 and kappa 0.4 for two readers on 50 yes/no items', () => {
    // Wikipedia, "Cohen's kappa" worked example: [[20, 5], [10, 15]] → p_o = 0.70, p_e = 0.50, κ = 0.4 (published).
    const detail = cohensKappaFromTable([[20, 5], [10, 15]])
    expect(detail.units).toBe(50)
    expect(detail.po).toBeCloseTo(0.7, 2)
    expect(detail.pe).toBeCloseTo(0.5, 2)
    expect(detail.kappa).toBeCloseTo(0.4, 1)
    const [a, b] = labelsFromTable([[20, 5], [10, 15]], ['yes', 'no'])
    expect(cohensKappa(a, b)).toBeCloseTo(0.4, 10)
    expect(percentAgreement(a, b)).toBeCloseTo(0.7, 10)
  })

  it('gives p_o .70, p_c .41 and kappa .492 for two judges, three categories, 200 subjects', () => {
    // Cohen (1960), numerical example: [[88, 14, 18], [10, 40, 10], [2, 6, 12]] → p_o = .70, p_c = .41, κ = .492 (published).
    const table = [[88, 14, 18], [10, 40, 10], [2, 6, 12]]
    const detail = cohensKappaFromTable(table)
    expect(detail.po).toBeCloseTo(0.7, 2)
    expect(detail.pe).toBeCloseTo(0.41, 2)
    expect(detail.kappa).toBeCloseTo(0.492, 3)
    expect(detail.kappa).toBeCloseTo(0.491525, 6) // computed value listed beside the published one (derived)
    const [a, b] = labelsFromTable(table, [1, 2, 3])
    expect(cohensKappa(a, b)).toBeCloseTo(0.491525, 6)
  })

  it('does not depend on the order in which categories first appear', () => {
    // Cohen (1960), numerical example, with the units listed from the last table cell to the first (derived).
    const [a, b] = labelsFromTable([[88, 14, 18], [10, 40, 10], [2, 6, 12]], ['x', 'y', 'z'])
    expect(cohensKappa([...a].reverse(), [...b].reverse())).toBeCloseTo(0.491525, 6)
  })
})

describe("Krippendorff's alpha on published examples", () => {
  it.each<[MeasurementLevel, number, number]>([
    // Krippendorff (2011), nominal example: α = 0.743 (published), 0.743421 (computed in the reference table).
    ['nominal', 0.743, 0.743421],
    // Krippendorff (2011), ordinal example: α = 0.815 (published), 0.815388 (computed).
    ['ordinal', 0.815, 0.815388],
    // Krippendorff (2011), interval example: α = 0.849 (published), 0.849107 (computed).
    ['interval', 0.849, 0.849107],
    // Krippendorff (2011), ratio example: α = 0.797 (published), 0.797403 (computed).
    ['ratio', 0.797, 0.797403],
  ])('gives the %s alpha of the 4 coders × 12 units example', (level, published, computed) => {
    const alpha = krippendorffAlpha(FOUR_CODERS, level)
    expect(alpha).toBeCloseTo(published, 3)
    expect(alpha).toBeCloseTo(computed, 6)
  })

  it('builds the coincidence matrix from the 40 pairable values of the example (derived)', () => {
    // Krippendorff (2011), nominal example; intermediates derived from its data: unit 12 drops out, n = 40,
    // n_1..n_5 = 9, 13, 10, 5, 3; D_o = 0.2, D_e = 0.779487.
    const detail = krippendorffAlphaDetail(FOUR_CODERS, 'nominal')
    expect(detail.pairable).toBeCloseTo(40, 10)
    expect(detail.values).toEqual([1, 2, 3, 4, 5])
    ;[9, 13, 10, 5, 3].forEach((total, i) => expect(detail.totals[i]).toBeCloseTo(total, 10))
    expect(detail.observed).toBeCloseTo(0.2, 10)
    expect(detail.expected).toBeCloseTo(0.779487, 6)
    expect(1 - detail.observed / detail.expected).toBeCloseTo(detail.alpha, 12)
  })

  it('drops out units with fewer than two values', () => {
    // Krippendorff (2011): a unit coded once adds nothing; removing unit 12 leaves every level unchanged (derived).
    const without12 = FOUR_CODERS.map((row) => row.slice(0, 11))
    for (const level of ['nominal', 'ordinal', 'interval', 'ratio'] as const)
      expect(krippendorffAlpha(without12, level)).toBeCloseTo(krippendorffAlpha(FOUR_CODERS, level), 12)
  })

  it('treats nominal values as names, whatever they are called', () => {
    // Krippendorff (2011), nominal example with the values renamed: α stays 0.743421 (derived).
    const names = ['family', 'fatigue', 'driving', 'work', 'mood']
    const renamed = FOUR_CODERS.map((row) => row.map((v) => (v === null ? null : names[v - 1])))
    expect(krippendorffAlpha(renamed, 'nominal')).toBeCloseTo(0.743421, 6)
  })

  it('gives the same ordinal alpha for any values in the same rank order', () => {
    // Krippendorff (2011): the ordinal difference depends on ranks and their marginal counts only (derived).
    const squared = FOUR_CODERS.map((row) => row.map((v) => (v === null ? null : v * v)))
    expect(krippendorffAlpha(squared, 'ordinal')).toBeCloseTo(0.815388, 6)
    expect(krippendorffAlpha(squared, 'interval')).not.toBeCloseTo(0.849107, 3)
  })

  it('gives alpha 0.095 for the binary example, with percent agreement 0.600 and kappa 0.090909', () => {
    // Krippendorff (2011), binary example: α = 0.095 (published), 0.095238 computed; percent agreement 0.600
    // and Cohen's κ 0.090909 derived from the same data.
    expect(krippendorffAlpha([BINARY_A, BINARY_B], 'nominal')).toBeCloseTo(0.095, 3)
    expect(krippendorffAlpha([BINARY_A, BINARY_B], 'nominal')).toBeCloseTo(0.095238, 6)
    expect(percentAgreement(BINARY_A, BINARY_B)).toBeCloseTo(0.6, 3)
    expect(cohensKappa(BINARY_A, BINARY_B)).toBeCloseTo(0.090909, 6)
  })

  it('gives the same binary values through the fast path from flags and from counts', () => {
    // Krippendorff (2011), binary example (derived counts: both 1, only A 1, only B 3, neither 5).
    const counts = binaryCounts(Uint8Array.from(BINARY_A), BINARY_B.map(Boolean))
    expect(counts).toEqual({ both: 1, onlyA: 1, onlyB: 3, neither: 5 })
    const result = binaryAgreementFromCounts(counts)
    expect(result.units).toBe(10)
    expect(result.percentAgreement).toBeCloseTo(0.6, 12)
    expect(result.kappa).toEqual({ value: expect.closeTo(0.090909, 6) })
    expect(result.alpha).toEqual({ value: expect.closeTo(0.095238, 6) })
    expect(binaryAgreement(BINARY_A, BINARY_B)).toEqual(result)
  })
})

describe("Fleiss' kappa on the published example", () => {
  it('gives P̄ 0.378, P̄_e 0.213 and kappa 0.210 for 10 subjects × 14 raters × 5 categories', () => {
    // Wikipedia, "Fleiss' kappa" worked example; Cardillo (2007): P̄ = 0.378, P̄_e = 0.213, κ = 0.210
    // (Cardillo prints 0.2099; computed 0.209931).
    const detail = fleissKappaDetail(FLEISS_TABLE)
    expect(detail.subjects).toBe(10)
    expect(detail.raters).toBe(14)
    expect(detail.pBar).toBeCloseTo(0.378, 3)
    expect(detail.peBar).toBeCloseTo(0.213, 3)
    expect(detail.kappa).toBeCloseTo(0.21, 3)
    expect(detail.kappa).toBeCloseTo(0.2099, 4)
    expect(fleissKappa(FLEISS_TABLE)).toBeCloseTo(0.209931, 6)
  })

  it('gives the per-category kappas 0.2013, 0.0797, 0.1716, 0.0304 and 0.5077', () => {
    // Cardillo (2007), Fleiss'es kappa, MATLAB Central File Exchange 15426: per-category κ_j for the same table.
    const perCategory = fleissKappaDetail(FLEISS_TABLE).perCategory
    ;[0.2013, 0.0797, 0.1716, 0.0304, 0.5077].forEach((kappa, j) => expect(perCategory[j]).toEqual({ value: expect.closeTo(kappa, 4) }))
  })

  it('leaves an unused category undefined without changing the overall kappa', () => {
    // Wikipedia, "Fleiss' kappa" worked example with a sixth category nobody chose (derived: p_6 = 0 adds nothing).
    const detail = fleissKappaDetail(FLEISS_TABLE.map((row) => [...row, 0]))
    expect(detail.kappa).toBeCloseTo(0.209931, 6)
    expect(detail.perCategory[5]).toMatchObject({ undefined: 'no-variation' })
  })
})

describe('inputs where agreement is not defined', () => {
  it('refuses two lists of different lengths', () => {
    expect(reasonOf(() => percentAgreement(['a', 'b'], ['a']))).toBe('unequal-lengths')
    expect(reasonOf(() => cohensKappa(['a'], ['a', 'b']))).toBe('unequal-lengths')
    expect(reasonOf(() => binaryCounts([1, 0], [1]))).toBe('unequal-lengths')
    expect(reasonOf(() => krippendorffAlpha([[1, 2], [1]], 'nominal'))).toBe('unequal-lengths')
  })

  it('refuses empty input', () => {
    expect(reasonOf(() => percentAgreement([], []))).toBe('no-units')
    expect(reasonOf(() => cohensKappa([], []))).toBe('no-units')
    expect(reasonOf(() => cohensKappaFromTable([[0, 0], [0, 0]]))).toBe('no-units')
    expect(reasonOf(() => binaryAgreementFromCounts({ both: 0, onlyA: 0, onlyB: 0, neither: 0 }))).toBe('no-units')
    expect(reasonOf(() => fleissKappa([]))).toBe('no-units')
    expect(reasonOf(() => krippendorffAlpha([], 'nominal'))).toBe('no-units')
    expect(reasonOf(() => krippendorffAlpha([[], []], 'nominal'))).toBe('no-units')
  })

  it('refuses alpha when no unit has two values', () => {
    // Krippendorff (2011): unit 12 of the 4 × 12 example holds one value only, so on its own nothing is pairable.
    expect(reasonOf(() => krippendorffAlpha(FOUR_CODERS.map((row) => row.slice(11)), 'nominal'))).toBe('no-pairable-values')
    expect(reasonOf(() => krippendorffAlpha([[1, 2, 3]], 'interval'))).toBe('no-pairable-values')
    expect(reasonOf(() => fleissKappa([[1, 0], [0, 1]]))).toBe('no-pairable-values')
  })

  it('refuses kappa and alpha when everyone used one category only, but still gives percent agreement', () => {
    // Common practice: with p_e = 1 (D_e = 0) the coefficients divide by zero; alpha is undefined, not 1.
    expect(percentAgreement(['fatigue', 'fatigue'], ['fatigue', 'fatigue'])).toBe(1)
    expect(reasonOf(() => cohensKappa(['fatigue', 'fatigue'], ['fatigue', 'fatigue']))).toBe('no-variation')
    expect(reasonOf(() => cohensKappaFromTable([[7, 0], [0, 0]]))).toBe('no-variation')
    expect(reasonOf(() => fleissKappa([[3, 0], [3, 0]]))).toBe('no-variation')
    for (const level of ['nominal', 'ordinal', 'interval', 'ratio'] as const)
      expect(reasonOf(() => krippendorffAlpha([[2, 2, null], [2, 2, 2]], level))).toBe('no-variation')
    const unused = binaryAgreementFromCounts({ both: 0, onlyA: 0, onlyB: 0, neither: 12 })
    expect(unused.percentAgreement).toBe(1)
    expect(unused.kappa).toMatchObject({ undefined: 'no-variation' })
    expect(unused.alpha).toMatchObject({ undefined: 'no-variation' })
  })

  it('refuses raters that differ between subjects', () => {
    expect(reasonOf(() => fleissKappa([[2, 1], [1, 1]]))).toBe('inconsistent-raters')
  })

  it('refuses categories where numbers are needed, and negative ratio values', () => {
    expect(reasonOf(() => krippendorffAlpha([['low', 'high'], ['low', 'low']], 'interval'))).toBe('non-numeric')
    expect(reasonOf(() => krippendorffAlpha([['low', 'high'], ['low', 'low']], 'ordinal'))).toBe('non-numeric')
    expect(reasonOf(() => krippendorffAlpha([[-1, 2], [1, 2]], 'ratio'))).toBe('invalid-input')
    expect(reasonOf(() => cohensKappaFromTable([[1, 2, 3], [4, 5, 6]]))).toBe('invalid-input')
    expect(reasonOf(() => cohensKappaFromTable([[1, -2], [3, 4]]))).toBe('invalid-input')
    expect(reasonOf(() => fleissKappa([[1, Number.NaN], [1, 1]]))).toBe('invalid-input')
  })

  it('explains itself in plain English and never returns NaN', () => {
    const error = (() => {
      try {
        cohensKappa(['a'], ['a'])
      } catch (caught) {
        return caught
      }
    })()
    expect(error).toBeInstanceOf(AgreementUndefinedError)
    expect(error).toBeInstanceOf(Error)
    expect((error as AgreementUndefinedError).name).toBe('AgreementUndefinedError')
    expect((error as AgreementUndefinedError).message).toMatch(/same single category/)
  })

  it('wraps results for callers that prefer not to catch', () => {
    expect(tryAgreement(() => cohensKappaFromTable([[20, 5], [10, 15]]).kappa)).toEqual({ value: expect.closeTo(0.4, 10) })
    const outcome = tryAgreement(() => cohensKappa([], []))
    expect(outcome).toEqual({ undefined: 'no-units', message: expect.stringMatching(/nothing to compare/) })
    expect(() => tryAgreement(() => { throw new TypeError('a bug, not an undefined coefficient') })).toThrow(TypeError)
  })
})

describe('cross-checks on seeded random data', () => {
  const CODES = ['family', 'fatigue', 'driving', 'work', 'mood']

  /** Two coders who agree with probability `agree`, otherwise pick any code. */
  function randomPair(random: () => number, units: number, categories: number, agree: number): [string[], string[]] {
    const pick = () => CODES[Math.floor(random() * categories)]
    const a = Array.from({ length: units }, pick)
    return [a, a.map((label) => (random() < agree ? label : pick()))]
  }

  it("matches the textbook confusion-matrix formula for Cohen's kappa on 50 trials of 200 units", () => {
    // Cohen (1960): κ = (p_o − p_e)/(1 − p_e), p_e = Σ_k (row_k/N)(col_k/N), written out here per category with
    // filters, independently of the table the implementation builds. No maintained npm package computing
    // Cohen's kappa was found; this second formulation is the cross-check.
    const random = seededRandom(20240611)
    for (let trial = 0; trial < 50; trial++) {
      const [a, b] = randomPair(random, 200, 2 + (trial % 4), random())
      const n = a.length
      const po = a.filter((label, i) => label === b[i]).length / n
      const pe = CODES.reduce((sum, c) => sum + (a.filter((x) => x === c).length / n) * (b.filter((x) => x === c).length / n), 0)
      expect(cohensKappa(a, b)).toBeCloseTo((po - pe) / (1 - pe), 12)
      expect(percentAgreement(a, b)).toBeCloseTo(po, 12)
    }
  })

  it('gives the same binary agreement through flags, labels and the coder × unit form', () => {
    // Internal consistency of the fast path with the general functions (derived).
    const random = seededRandom(42)
    for (let trial = 0; trial < 20; trial++) {
      const a = Array.from({ length: 300 }, () => (random() < 0.3 ? 1 : 0))
      const b = a.map((bit) => (random() < 0.8 ? bit : 1 - bit))
      const fast = binaryAgreement(a, b)
      expect(fast.kappa).toEqual({ value: expect.closeTo(cohensKappa(a, b), 12) })
      expect(fast.alpha).toEqual({ value: expect.closeTo(krippendorffAlpha([a, b], 'nominal'), 12) })
      expect(fast.percentAgreement).toBeCloseTo(percentAgreement(a, b), 12)
    }
  })

})
