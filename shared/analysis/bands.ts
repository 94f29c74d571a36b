/**
 * Interpretation bands for agreement coefficients, each with its published source. The band names follow the
 * sources; the advice is our own plain wording. Cut points are upper-inclusive for kappa (0.20 is "slight",
 * 0.21 "fair") and lower-inclusive for alpha (0.800 is "reliable", 0.667 "tentative").
 */

export interface AgreementBand {
  /** stable id for styling and tests */
  level: string
  /** short name shown beside the value */
  label: string
  /** one plain sentence on what the value means for the team */
  advice: string
  /** the published source of the cut points */
  source: string
}

export const KAPPA_BAND_SOURCE = 'Landis & Koch (1977), Biometrics 33(1):159–174'
export const ALPHA_BAND_SOURCE = 'Krippendorff (2004), Content Analysis, 2nd ed., §11.4.4'

type BandRow = Omit<AgreementBand, 'source'> & { upTo: number }

const KAPPA_BANDS: readonly BandRow[] = [
  { upTo: 0, level: 'poor', label: 'Poor', advice: 'The coders agree less often than chance would predict; compare definitions before going on.' },
  { upTo: 0.2, level: 'slight', label: 'Slight', advice: 'Agreement is barely above chance; the code definitions likely need work.' },
  { upTo: 0.4, level: 'fair', label: 'Fair', advice: 'Some agreement beyond chance; discuss the disagreements and sharpen the definitions.' },
  { upTo: 0.6, level: 'moderate', label: 'Moderate', advice: 'Coders agree beyond chance but not yet consistently; a calibration round should help.' },
  { upTo: 0.8, level: 'substantial', label: 'Substantial', advice: 'Coders apply this code consistently in most places.' },
  { upTo: 1, level: 'almost-perfect', label: 'Almost perfect', advice: 'Coders apply this code in nearly the same way.' },
]

function checkCoefficient(value: number, name: string): void {
  if (!Number.isFinite(value) || value > 1 + 1e-12) throw new RangeError(`${name} must be a number no greater than 1; got ${value}.`)
}

/**
 * Band of a Cohen's or Fleiss' kappa per Landis & Koch (1977): below 0 poor; up to 0.20 slight; up to 0.40 fair;
 * up to 0.60 moderate; up to 0.80 substantial; up to 1 almost perfect. Throws RangeError for NaN or values above 1.
 */
export function kappaBand(kappa: number): AgreementBand {
  checkCoefficient(kappa, 'Kappa')
  const row = kappa < 0 ? KAPPA_BANDS[0] : (KAPPA_BANDS.slice(1).find((band) => kappa <= band.upTo) ?? KAPPA_BANDS[KAPPA_BANDS.length - 1])
  return { level: row.level, label: row.label, advice: row.advice, source: KAPPA_BAND_SOURCE }
}

/**
 * Band of a Krippendorff's alpha per Krippendorff (2004): at or above 0.800 reliable; from 0.667 up to 0.800
 * tentative conclusions only; below 0.667 do not rely on it. Throws RangeError for NaN or values above 1.
 */
export function alphaBand(alpha: number): AgreementBand {
  checkCoefficient(alpha, 'Alpha')
  if (alpha >= 0.8)
    return { level: 'reliable', label: 'Reliable', advice: 'Coders agree well enough to rely on this code in the analysis.', source: ALPHA_BAND_SOURCE }
  if (alpha >= 0.667)
    return {
      level: 'tentative',
      label: 'Tentative',
      advice: 'Good enough for tentative conclusions only; refine the definition before relying on it.',
      source: ALPHA_BAND_SOURCE,
    }
  return {
    level: 'unreliable',
    label: 'Do not rely on it',
    advice: 'Coders do not yet apply this code consistently; revise its definition and code again.',
    source: ALPHA_BAND_SOURCE,
  }
}
