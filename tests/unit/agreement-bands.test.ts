import { describe, expect, it } from 'vitest'
import { ALPHA_BAND_SOURCE, alphaBand, KAPPA_BAND_SOURCE, kappaBand } from '../../shared/analysis/bands.js'

describe('kappa bands', () => {
  // Landis & Koch (1977), Biometrics 33(1):159–174: <0 poor; 0–0.20 slight; 0.21–0.40 fair; 0.41–0.60 moderate;
  // 0.61–0.80 substantial; 0.81–1.00 almost perfect. Printed at two decimals with gaps; cut points here are
  // upper-inclusive (≤0.20, ≤0.40, ≤0.60, ≤0.80), so 0.205 is fair.
  it.each([
    [-1, 'poor'],
    [-0.01, 'poor'],
    [0, 'slight'],
    [0.2, 'slight'],
    [0.205, 'fair'],
    [0.21, 'fair'],
    [0.4, 'fair'],
    [0.41, 'moderate'],
    [0.6, 'moderate'],
    [0.61, 'substantial'],
    [0.8, 'substantial'],
    [0.81, 'almost-perfect'],
    [1, 'almost-perfect'],
  ])('puts kappa %d in the "%s" band', (kappa, level) => {
    expect(kappaBand(kappa)).toMatchObject({ level, source: KAPPA_BAND_SOURCE })
  })

  it('names the bands as the source does and cites it', () => {
    // Landis & Koch (1977): the six band names.
    expect([-0.5, 0.1, 0.3, 0.5, 0.7, 0.9].map((k) => kappaBand(k).label)).toEqual([
      'Poor', 'Slight', 'Fair', 'Moderate', 'Substantial', 'Almost perfect',
    ])
    expect(KAPPA_BAND_SOURCE).toMatch(/Landis & Koch \(1977\)/)
    expect(kappaBand(0.5).advice.length).toBeGreaterThan(20)
  })

  it('refuses a value that is not a kappa', () => {
    expect(() => kappaBand(Number.NaN)).toThrow(RangeError)
    expect(() => kappaBand(1.2)).toThrow(RangeError)
  })
})

describe('alpha bands', () => {
  // Krippendorff (2004), Content Analysis, 2nd ed., §11.4.4 (page from memory): rely on α ≥ 0.800; tentative
  // conclusions only for 0.667 ≤ α < 0.800; below 0.667 do not rely on it.
  it.each([
    [1, 'reliable'],
    [0.8, 'reliable'],
    [0.7999, 'tentative'],
    [0.667, 'tentative'],
    [0.6669, 'unreliable'],
    [2 / 3, 'unreliable'],
    [0, 'unreliable'],
    [-0.3, 'unreliable'],
  ])('puts alpha %d in the "%s" band', (alpha, level) => {
    expect(alphaBand(alpha)).toMatchObject({ level, source: ALPHA_BAND_SOURCE })
  })

  it('cites Krippendorff (2004) and says plainly whether to rely on the code', () => {
    expect(ALPHA_BAND_SOURCE).toMatch(/Krippendorff \(2004\)/)
    expect(alphaBand(0.9).label).toBe('Reliable')
    expect(alphaBand(0.7).label).toBe('Tentative')
    expect(alphaBand(0.5).label).toBe('Do not rely on it')
  })

  it('refuses a value that is not an alpha', () => {
    expect(() => alphaBand(Number.POSITIVE_INFINITY)).toThrow(RangeError)
    expect(() => alphaBand(1.01)).toThrow(RangeError)
  })
})
