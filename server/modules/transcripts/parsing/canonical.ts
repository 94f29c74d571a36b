import { TranscriptParseError, type ParsedTranscript, type Segment, type TranscriptFormat } from './types.js'

const TURN_SEPARATOR = '\n\n'

/** Collapses runs of spaces and tabs (not line breaks) to one space and trims the ends (common practice). */
export function tidySpaces(value: string): string {
  return value.replace(/[^\S\n]+/g, ' ').trim()
}

/**
 * Counts whitespace-separated tokens that hold at least one letter or digit, so a lone dash or emoji is
 * not a word (common practice). Languages written without spaces count one word per run.
 */
export function countWords(text: string): number {
  let count = 0
  for (const token of text.split(/\s+/)) if (/[\p{L}\p{N}]/u.test(token)) count++
  return count
}

/**
 * Places the segments in the canonical text. Each segment's text and speaker are normalised to NFC
 * (UAX #15) first and the offsets computed afterwards; "\n" is a starter that composes with nothing,
 * so joining NFC pieces with it keeps the whole text NFC.
 */
export function assemble(format: TranscriptFormat, segments: Segment[]): ParsedTranscript {
  const pieces: string[] = []
  const turns: ParsedTranscript['turns'] = []
  let offset = 0
  for (const segment of segments) {
    const body = segment.text.normalize('NFC')
    if (!body) continue
    if (pieces.length) offset += TURN_SEPARATOR.length
    turns.push({ speaker: segment.speaker.normalize('NFC'), startMs: segment.startMs, start: offset, end: offset + body.length })
    pieces.push(body)
    offset += body.length
  }
  if (!turns.length) throw new TranscriptParseError('no-text', 'The transcript has no spoken text in it.')
  const text = pieces.join(TURN_SEPARATOR)
  return { format, text, turns, wordCount: countWords(text) }
}
