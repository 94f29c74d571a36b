import { syllable } from 'syllable'

/**
 * Readability of plain English text by the Flesch formulas. Nothing is rounded here: the UI
 * rounds for display, and the tests compare with published values to their printed precision.
 */
export interface TextCounts {
  words: number
  sentences: number
  syllables: number
}

export interface Readability extends TextCounts {
  readingEase: number
  grade: number
  /** the Flesch–Kincaid grade is above READABILITY_GUIDANCE.maxGrade */
  aboveGuidance: boolean
}

export const READABILITY_GUIDANCE = {
  maxGrade: 8,
  source: 'Paasche-Orlow, Taylor & Brancati (2003), NEJM 348(8):721–726',
  text: 'Ethics boards commonly ask for consent forms written at a grade 8 reading level or below. Short sentences and everyday words help.',
} as const

function checkCounts({ words, sentences, syllables }: TextCounts): void {
  if (!(words > 0)) throw new RangeError('Readability needs at least one word.')
  if (!(sentences > 0)) throw new RangeError('Readability needs at least one sentence.')
  if (!(syllables >= 0)) throw new RangeError('The syllable count cannot be negative.')
}

/** Flesch (1948): 206.835 − 1.015 (words/sentences) − 84.6 (syllables/words). Higher is easier. */
export function fleschReadingEase(counts: TextCounts): number {
  checkCounts(counts)
  const { words, sentences, syllables } = counts
  return 206.835 - 1.015 * (words / sentences) - 84.6 * (syllables / words)
}

/** Kincaid et al. (1975): 0.39 (words/sentences) + 11.8 (syllables/words) − 15.59, a US school grade. */
export function fleschKincaidGrade(counts: TextCounts): number {
  checkCounts(counts)
  const { words, sentences, syllables } = counts
  return 0.39 * (words / sentences) + 11.8 * (syllables / words) - 15.59
}

/**
 * A word is a run of letters or digits, joined through apostrophes ("don't") and hyphens
 * ("follow-up"), and through a point or comma between digits ("3.5", "1,200").
 */
const WORD = /[\p{L}\p{N}]+(?:(?:['’-]|(?<=\p{N})[.,](?=\p{N}))[\p{L}\p{N}]+)*/gu

/**
 * A sentence ends at . ! or ? (with any closing quote or bracket) followed by a space or the end,
 * and at every line break: form text is typed or pasted into a text box, where a line is a
 * paragraph, a heading or a list item, none of which runs on into the next line. Abbreviations
 * such as "e.g." end a sentence too — a known limit of counting by punctuation.
 */
const SENTENCE_END = /[.!?]+["'”’)\]]*(?=\s|$)|\r?\n|\r/u

export function countWords(text: string): string[] {
  return text.match(WORD) ?? []
}

/** The counter finds no syllable in digits; a number is read aloud, so each word counts at least one. */
export function countSyllables(word: string): number {
  return Math.max(1, syllable(word))
}

export function readability(text: string): Readability | null {
  const words = countWords(text)
  if (words.length === 0) return null
  const sentences = text.split(SENTENCE_END).filter((part) => countWords(part).length > 0).length
  const counts = { words: words.length, sentences, syllables: words.reduce((sum, word) => sum + countSyllables(word), 0) }
  const grade = fleschKincaidGrade(counts)
  return { ...counts, readingEase: fleschReadingEase(counts), grade, aboveGuidance: grade > READABILITY_GUIDANCE.maxGrade }
}
