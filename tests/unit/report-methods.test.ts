import { describe, expect, it } from 'vitest'
import { methodsParagraphs, type MethodsFacts } from '../../shared/reports/methods-summary.js'

// The wording is our own; the coefficients are formatted as is common practice (two decimals for
// alpha and kappa, one for a percentage) and cited to Krippendorff (2004) and Landis & Koch (1977).
const full: MethodsFacts = {
  interviews: 12,
  modes: [
    { mode: 'in_person', count: 7 },
    { mode: 'video', count: 4 },
    { mode: 'phone', count: 1 },
  ],
  duration: { n: 12, mean: 47.3, median: 45, min: 28, max: 74 },
  coders: 2,
  agreement: { unit: 'turn', alpha: 0.812, kappa: 0.7849, percentAgreement: 0.95 },
  saturation: 'No new codes appeared in the last three interviews.',
  reviewRounds: 2,
  partnerAnswers: 9,
}

const empty: MethodsFacts = {
  interviews: 0,
  modes: [],
  duration: null,
  coders: 0,
  agreement: null,
  saturation: null,
  reviewRounds: 0,
  partnerAnswers: 0,
}

describe('methodsParagraphs', () => {
  it('describes a study with interviews, coding, saturation and partner review', () => {
    expect(methodsParagraphs(full)).toEqual([
      'We completed 12 interviews (7 in person, 4 by video call and 1 by telephone). Interviews lasted a mean of 47.3 minutes (median 45, range 28–74 minutes).',
      "Two researchers coded the transcripts. Inter-coder agreement on turns: Krippendorff's alpha 0.81, Cohen's kappa 0.78, percent agreement 95.0% (Krippendorff 2004; Landis & Koch 1977).",
      'No new codes appeared in the last three interviews.',
      'Patient partners reviewed the emerging findings in two review rounds and gave nine answers.',
    ])
  })

  it('says what has not happened yet for an empty study', () => {
    const text = methodsParagraphs(empty)
    expect(text).toEqual([
      'No interviews have been completed yet.',
      'No transcripts have been coded yet.',
      'Patient partners have not yet been asked to review the emerging findings.',
    ])
  })

  it('leaves out what is missing and never prints NaN or undefined', () => {
    const partial: MethodsFacts = {
      ...full,
      interviews: 3,
      modes: [{ mode: 'video', count: 3 }],
      duration: { n: 2, mean: 40.5, median: 40.5, min: 36, max: 45 },
      coders: 1,
      agreement: { unit: 'sentence', alpha: null, kappa: 0.6, percentAgreement: null },
      saturation: '   ',
      reviewRounds: 1,
      partnerAnswers: 1,
    }
    const text = methodsParagraphs(partial)
    expect(text).toEqual([
      'We completed three interviews (3 by video call). Interviews lasted a mean of 40.5 minutes (median 40.5, range 36–45 minutes; 2 interviews with a recorded length).',
      "One researcher coded the transcripts. Inter-coder agreement on sentences: Cohen's kappa 0.60 (Krippendorff 2004; Landis & Koch 1977).",
      'Patient partners reviewed the emerging findings in one review round and gave one answer.',
    ])
    const none = methodsParagraphs({ ...partial, agreement: { unit: 'turn', alpha: null, kappa: null, percentAgreement: null } })
    expect(none[1]).toBe('One researcher coded the transcripts. Inter-coder agreement on turns could not be computed yet.')
    for (const p of [...text, ...none, ...methodsParagraphs(full), ...methodsParagraphs(empty)]) expect(p).not.toMatch(/NaN|undefined|null/)
  })
})
