/**
 * Excerpt offsets are UTF-16 code units — the indices of a JavaScript string — on the client and on
 * the server alike, so `text.slice(start, end)` means the same passage on both sides. A range must not
 * cut a user-perceived character in two (a surrogate pair of an emoji, a letter and its combining
 * accent, an emoji sequence joined with ZWJ): boundaries are snapped to grapheme clusters
 * (Unicode UAX #29 through `Intl.Segmenter`).
 */

const WINDOW = 64
/** one segmenter for every call: creating an Intl.Segmenter is costly */
const graphemes = new Intl.Segmenter(undefined, { granularity: 'grapheme' })

/** True when `index` falls between two grapheme clusters of `text` (0 and text.length always do). */
export function isGraphemeBoundary(text: string, index: number): boolean {
  if (index <= 0 || index >= text.length) return index === 0 || index === text.length
  const from = Math.max(0, index - WINDOW)
  const to = Math.min(text.length, index + WINDOW)
  const segmenter = graphemes
  for (const { index: at } of segmenter.segment(text.slice(from, to))) {
    if (from + at === index) return true
    if (from + at > index) return false
  }
  return false
}

/** Moves `index` back (side 'start') or forward (side 'end') to the nearest grapheme boundary. */
export function snapToGrapheme(text: string, index: number, side: 'start' | 'end'): number {
  const clamped = Math.min(Math.max(index, 0), text.length)
  if (isGraphemeBoundary(text, clamped)) return clamped
  const from = Math.max(0, clamped - WINDOW)
  const to = Math.min(text.length, clamped + WINDOW)
  const segmenter = graphemes
  let before = from
  for (const { index: at, segment } of segmenter.segment(text.slice(from, to))) {
    const start = from + at
    const end = start + segment.length
    if (start <= clamped && clamped < end) return side === 'start' ? start : end
    before = end
  }
  return side === 'start' ? before : to
}

/** Trims white space from both ends of a range (a selection often takes a trailing space or newline). */
export function trimRange(text: string, start: number, end: number): [number, number] {
  let s = start
  let e = end
  while (s < e && /\s/u.test(text[s]!)) s++
  while (e > s && /\s/u.test(text[e - 1]!)) e--
  return [s, e]
}

/** A selection made in the browser, snapped to graphemes and trimmed: what the client sends. */
export function normaliseRange(text: string, start: number, end: number): { start: number; end: number } | null {
  const [a, b] = start <= end ? [start, end] : [end, start]
  const [s, e] = trimRange(text, snapToGrapheme(text, a, 'start'), snapToGrapheme(text, b, 'end'))
  return e > s ? { start: s, end: e } : null
}

export type RangeProblem = { field: 'start' | 'end' | 'text'; message: string }

/** What is wrong with an excerpt range on `text`, or null when it is sound. The server's check. */
export function checkRange(text: string, start: number, end: number, quote: string): RangeProblem | null {
  if (!Number.isInteger(start) || !Number.isInteger(end)) return { field: 'start', message: 'Offsets are whole numbers.' }
  if (start < 0) return { field: 'start', message: 'The excerpt starts before the beginning of the transcript.' }
  if (end > text.length) return { field: 'end', message: `The excerpt ends after the end of the transcript (${text.length} characters).` }
  if (end <= start) return { field: 'end', message: 'The excerpt must end after it starts: select at least one character.' }
  if (!isGraphemeBoundary(text, start)) return { field: 'start', message: 'The excerpt starts in the middle of a character (an emoji or an accented letter). Select again.' }
  if (!isGraphemeBoundary(text, end)) return { field: 'end', message: 'The excerpt ends in the middle of a character (an emoji or an accented letter). Select again.' }
  if (text.slice(start, end) !== quote.normalize('NFC') && text.slice(start, end) !== quote)
    return { field: 'text', message: 'The selected text does not match the transcript at these positions. Reload the transcript and select again.' }
  return null
}

/** Whether two half-open ranges share at least one character. */
export const overlaps = (a: { start: number; end: number }, b: { start: number; end: number }): boolean => a.start < b.end && b.start < a.end
