/**
 * How the coding view cuts a transcript for display: blocks (speaker turns, plus any text between
 * them), segments (a block cut at every excerpt boundary, each knowing which excerpts cover it),
 * underline lanes, and the words and sentences keyboard selection steps over. Offsets are UTF-16
 * code units, as in offsets.ts.
 */
import { trimRange } from './offsets.js'

export interface Span {
  start: number
  end: number
}

export interface ReadingTurn extends Span {
  speaker: string
  startMs: number | null
}

export interface TextBlock extends Span {
  key: string
  /** null for text that falls outside every turn */
  speaker: string | null
  startMs: number | null
}

/** The turns in reading order, with any non-blank text between or around them as blocks of their own. */
export function readingBlocks(text: string, turns: readonly ReadingTurn[]): TextBlock[] {
  const blocks: TextBlock[] = []
  let cursor = 0
  const addGap = (end: number) => {
    const [start, stop] = trimRange(text, cursor, end)
    if (stop > start) blocks.push({ key: `gap-${start}`, start, end: stop, speaker: null, startMs: null })
  }
  const sorted = [...turns].sort((a, b) => a.start - b.start || a.end - b.end)
  for (const turn of sorted) {
    const start = Math.max(cursor, Math.min(turn.start, text.length))
    const end = Math.min(Math.max(turn.end, start), text.length)
    if (end <= start) continue
    addGap(start)
    blocks.push({ key: `turn-${start}`, start, end, speaker: turn.speaker, startMs: turn.startMs })
    cursor = end
  }
  addGap(text.length)
  return blocks
}

export interface Mark extends Span {
  id: string
}

export interface Segment extends Span {
  /** ids of the marks covering the whole segment, in the marks' reading order */
  marks: string[]
}

/**
 * Cuts each block at every mark boundary inside it. One sweep over the sorted boundaries:
 * O((n + e) log e) for n blocks and e marks, plus the size of the answer. Blocks must be in
 * reading order and must not overlap (as readingBlocks gives them); marks may cross blocks.
 */
export function segmentBlocks(blocks: readonly Span[], marks: readonly Mark[]): Segment[][] {
  const ordered = marks.filter((m) => m.end > m.start).sort((a, b) => a.start - b.start || b.end - a.end || (a.id < b.id ? -1 : 1))
  const rank = new Map(ordered.map((m, i) => [m.id, i]))
  const events = ordered.flatMap((m) => [
    { at: m.start, id: m.id, open: true },
    { at: m.end, id: m.id, open: false },
  ])
  events.sort((a, b) => a.at - b.at)
  const active = new Set<string>()
  let next = 0
  const applyThrough = (at: number) => {
    while (next < events.length && events[next]!.at <= at) {
      const event = events[next++]!
      if (event.open) active.add(event.id)
      else active.delete(event.id)
    }
  }
  const covering = () => [...active].sort((a, b) => rank.get(a)! - rank.get(b)!)

  return blocks.map((block) => {
    applyThrough(block.start)
    const segments: Segment[] = []
    let cursor = block.start
    while (next < events.length && events[next]!.at < block.end) {
      const at = events[next]!.at
      if (at > cursor) segments.push({ start: cursor, end: at, marks: covering() })
      cursor = Math.max(cursor, at)
      applyThrough(at)
    }
    if (block.end > cursor) segments.push({ start: cursor, end: block.end, marks: covering() })
    return segments
  })
}

/**
 * Gives each mark an underline lane so that overlapping marks never share one and a mark keeps its
 * lane along its whole length (greedy interval colouring in order of start: lowest free lane).
 */
export function assignLanes(marks: readonly Mark[]): Map<string, number> {
  const lanes = new Map<string, number>()
  const laneEnds: number[] = []
  const ordered = [...marks].sort((a, b) => a.start - b.start || b.end - a.end)
  for (const mark of ordered) {
    let lane = laneEnds.findIndex((end) => end <= mark.start)
    if (lane === -1) lane = laneEnds.length
    laneEnds[lane] = mark.end
    lanes.set(mark.id, lane)
  }
  return lanes
}

const REACH = 400

function wordSpans(text: string, from: number, to: number): Span[] {
  const segmenter = new Intl.Segmenter(undefined, { granularity: 'word' })
  const spans: Span[] = []
  for (const piece of segmenter.segment(text.slice(from, to))) {
    if (piece.isWordLike || /[^\s\p{P}]/u.test(piece.segment)) spans.push({ start: from + piece.index, end: from + piece.index + piece.segment.length })
  }
  return spans
}

/**
 * The next word edge from `index`: forward, the end of the first word ending after it; back, the
 * start of the last word starting before it. Words are UAX #29 word segments (Intl.Segmenter).
 * Returns `index` when there is no word that way.
 */
export function wordStep(text: string, index: number, direction: 1 | -1): number {
  const words = wordSpans(text, Math.max(0, index - REACH), Math.min(text.length, index + REACH))
  if (direction === 1) return words.find((w) => w.end > index)?.end ?? index
  for (let i = words.length - 1; i >= 0; i--) if (words[i]!.start < index) return words[i]!.start
  return index
}

/** The sentences of one block (UAX #29 sentence segments), trimmed of white space. */
export function sentencesOf(text: string, block: Span): Span[] {
  const segmenter = new Intl.Segmenter(undefined, { granularity: 'sentence' })
  const spans: Span[] = []
  for (const piece of segmenter.segment(text.slice(block.start, block.end))) {
    const [start, end] = trimRange(text, block.start + piece.index, block.start + piece.index + piece.segment.length)
    if (end > start) spans.push({ start, end })
  }
  return spans
}

/** The index of the block holding `offset` (or the first block after it), by binary search; -1 past the end. */
export function blockIndexAt(blocks: readonly Span[], offset: number): number {
  let low = 0
  let high = blocks.length
  while (low < high) {
    const middle = (low + high) >> 1
    if (blocks[middle]!.end <= offset) low = middle + 1
    else high = middle
  }
  return low < blocks.length ? low : -1
}
