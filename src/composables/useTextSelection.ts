import { onBeforeUnmount, onMounted, type Ref } from 'vue'

export interface TextSpan {
  start: number
  end: number
}

/*
 * Transcript views render their text as pieces, each an element whose `data-start` is the offset of
 * its first character in the transcript and whose only child is its text node. A DOM position
 * (node, offset) inside a piece's text node is then transcript offset = data-start + offset: both
 * count UTF-16 code units, so emoji, combining accents and CJK need no special care here.
 */

const PIECE = '[data-start]'

const pieceStart = (piece: Element): number => Number((piece as HTMLElement).dataset.start)
const pieceEnd = (piece: Element): number => pieceStart(piece) + (piece.textContent ?? '').length

/** A DOM position outside every piece (a speaker column, a paragraph edge) counts as the start of the first piece after it. */
function firstPieceAfter(root: HTMLElement, node: Node, offset: number): number | null {
  const pieces = root.querySelectorAll(PIECE)
  if (!pieces.length) return null
  const point = document.createRange()
  point.setStart(node, offset)
  point.collapse(true)
  let low = 0
  let high = pieces.length
  while (low < high) {
    const middle = (low + high) >> 1
    if (point.comparePoint(pieces[middle]!, 0) < 0) low = middle + 1
    else high = middle
  }
  return low < pieces.length ? pieceStart(pieces[low]!) : pieceEnd(pieces[pieces.length - 1]!)
}

/** A DOM position as an offset into the transcript text, or null when it lies outside `root`. */
export function offsetAt(root: HTMLElement, node: Node, offset: number): number | null {
  if (!root.contains(node)) return null
  if (node.nodeType === Node.TEXT_NODE && node.parentElement?.matches(PIECE)) return pieceStart(node.parentElement) + offset
  if (node instanceof Element && node.matches(PIECE)) return offset === 0 ? pieceStart(node) : pieceEnd(node)
  return firstPieceAfter(root, node, offset)
}

/** A DOM range as transcript offsets, exactly as selected (not yet snapped or trimmed). */
export function spanOfRange(root: HTMLElement, range: Range): TextSpan | null {
  const start = offsetAt(root, range.startContainer, range.startOffset)
  const end = offsetAt(root, range.endContainer, range.endOffset)
  if (start === null || end === null) return null
  return start <= end ? { start, end } : { start: end, end: start }
}

/** The reader's current selection inside `root` as transcript offsets, or null when there is none. */
export function selectedSpan(root: HTMLElement): TextSpan | null {
  const selection = document.getSelection()
  if (!selection || selection.isCollapsed || !selection.rangeCount) return null
  const range = selection.getRangeAt(0)
  if (!root.contains(range.startContainer) || !root.contains(range.endContainer)) return null
  return spanOfRange(root, range)
}

/** The piece holding `offset`: at a boundary, the one starting there (`side` 'start') or ending there ('end'). */
function pieceAt(root: HTMLElement, offset: number, side: 'start' | 'end'): Element | null {
  const pieces = root.querySelectorAll(PIECE)
  let low = 0
  let high = pieces.length
  while (low < high) {
    const middle = (low + high) >> 1
    const end = pieceEnd(pieces[middle]!)
    if (end < offset || (side === 'start' && end === offset)) low = middle + 1
    else high = middle
  }
  const piece = pieces[low]
  return piece && pieceStart(piece) <= offset ? piece : null
}

/** Transcript offsets as a DOM range over the rendered pieces, or null when either end is not rendered. */
export function rangeOfSpan(root: HTMLElement, span: TextSpan): Range | null {
  const first = pieceAt(root, span.start, 'start')
  const last = pieceAt(root, span.end, 'end')
  if (!first?.firstChild || !last?.firstChild) return null
  const range = document.createRange()
  range.setStart(first.firstChild, span.start - pieceStart(first))
  range.setEnd(last.firstChild, span.end - pieceStart(last))
  return range
}

/** Makes `span` the document's selection, as if the reader had selected it. */
export function selectSpan(root: HTMLElement, span: TextSpan): boolean {
  const range = rangeOfSpan(root, span)
  const selection = document.getSelection()
  if (!range || !selection) return false
  selection.removeAllRanges()
  selection.addRange(range)
  return true
}

/**
 * Follows the reader's selection inside `root`, by mouse or keyboard (the selection changes either
 * way), and reports it as character offsets into the text, trimmed of surrounding spaces.
 */
export function useTextSelection(root: Ref<HTMLElement | null>, text: () => string, onSelect: (span: TextSpan) => void) {
  function check(): void {
    if (!root.value) return
    const span = selectedSpan(root.value)
    if (!span) return
    let { start, end } = span
    const whole = text()
    while (start < end && /\s/.test(whole[start])) start += 1
    while (end > start && /\s/.test(whole[end - 1])) end -= 1
    if (end > start) onSelect({ start, end })
  }
  onMounted(() => document.addEventListener('selectionchange', check))
  onBeforeUnmount(() => document.removeEventListener('selectionchange', check))
  return { check }
}
