import { onBeforeUnmount, onMounted, type Ref } from 'vue'
import { blockIndexAt, sentencesOf, wordStep, type Span, type TextBlock } from '@shared/coding/segments'
import { normaliseRange } from '@shared/coding/offsets'
import { selectedSpan, selectSpan } from './useTextSelection'

/** Heardwell's own keys for reading and coding (shown in the shortcuts help). */
export const CODING_SHORTCUTS: { keys: string[]; does: string }[] = [
  { keys: ['↓'], does: 'Select the next sentence' },
  { keys: ['↑'], does: 'Select the previous sentence' },
  { keys: [']'], does: 'Go to the next turn' },
  { keys: ['['], does: 'Go to the previous turn' },
  { keys: ['T'], does: 'Select the whole turn' },
  { keys: ['Shift', '↓'], does: 'Take in the next sentence too' },
  { keys: ['Shift', '↑'], does: 'Let go of the last sentence' },
  { keys: ['Shift', '→'], does: 'End the selection one word later' },
  { keys: ['Shift', '←'], does: 'End the selection one word earlier' },
  { keys: ['Alt', 'Shift', '←'], does: 'Start the selection one word earlier' },
  { keys: ['Alt', 'Shift', '→'], does: 'Start the selection one word later' },
  { keys: ['Enter'], does: 'Code the selected passage (opens the code panel)' },
  { keys: ['E'], does: 'Go to the next excerpt mark (its codes show beside it)' },
  { keys: ['Shift', 'E'], does: 'Go to the previous excerpt mark' },
  { keys: ['Enter'], does: 'On an excerpt mark: show the excerpt in the list, with its changes' },
  { keys: ['Esc'], does: 'Close the code panel, or clear the selection' },
  { keys: ['?'], does: 'Show these shortcuts' },
]

export interface CodingShortcutOptions {
  root: Ref<HTMLElement | null>
  text: () => string
  blocks: () => TextBlock[]
  /** renders blocks up to this index (long transcripts are rendered in batches) */
  reveal: (blockIndex: number) => Promise<void>
  onSelect: (span: Span) => void
  onCode: (span: Span) => void
  onClear: () => void
}

/** Keyboard selection in the reading text: sentences, turns and words, as a real document selection. */
export function useCodingShortcuts(options: CodingShortcutOptions) {
  const sentenceCache = new Map<string, Span[]>()
  const sentences = (block: TextBlock) => {
    let found = sentenceCache.get(`${block.key}:${block.end}`)
    if (!found) sentenceCache.set(`${block.key}:${block.end}`, (found = sentencesOf(options.text(), block)))
    return found
  }

  function firstBlockInView(): number {
    const turns = options.root.value?.querySelectorAll<HTMLElement>('[data-block]') ?? []
    for (const turn of turns) if (turn.getBoundingClientRect().bottom > 0) return Number(turn.dataset.block)
    return 0
  }

  /** The first sentence starting at or after `offset` (or, to extend a selection, ending after it). */
  function sentenceAfter(offset: number, extend = false): Span | null {
    const blocks = options.blocks()
    const from = blockIndexAt(blocks, offset)
    if (from === -1) return null
    for (let i = from; i < blocks.length; i++) {
      const found = sentences(blocks[i]!).find((s) => (extend ? s.end > offset : s.start >= offset))
      if (found) return found
    }
    return null
  }

  function sentenceBefore(offset: number): Span | null {
    const blocks = options.blocks()
    const from = blockIndexAt(blocks, offset)
    for (let i = from === -1 ? blocks.length - 1 : from; i >= 0; i--) {
      const found = sentences(blocks[i]!).filter((s) => s.end <= offset)
      if (found.length) return found[found.length - 1]!
    }
    return null
  }

  async function choose(span: Span | null): Promise<void> {
    const root = options.root.value
    if (!span || !root) return
    const range = normaliseRange(options.text(), span.start, span.end)
    if (!range) return
    await options.reveal(blockIndexAt(options.blocks(), range.end - 1))
    if (!selectSpan(root, range)) return
    const node = document.getSelection()?.focusNode
    ;(node instanceof Element ? node : node?.parentElement)?.scrollIntoView?.({ block: 'nearest' })
    options.onSelect(range)
  }

  function turnAt(offset: number, step: number): TextBlock | null {
    const blocks = options.blocks()
    const at = blockIndexAt(blocks, offset)
    return blocks[(at === -1 ? blocks.length : at) + step] ?? null
  }

  const firstSentence = (block: TextBlock | null): Span | null => (block ? (sentences(block)[0] ?? null) : null)
  const within = (start: number, end: number): Span | null => (end > start ? { start, end } : null)

  /** Where a key moves the selection, or undefined when the key is not one of ours. */
  function target(event: KeyboardEvent, current: Span | null): Span | null | undefined {
    const text = options.text()
    const here = current?.start ?? options.blocks()[firstBlockInView()]?.start ?? 0
    const key = event.key.length === 1 ? event.key.toLowerCase() : event.key
    if (!event.shiftKey && !event.altKey) {
      if (key === 'ArrowDown') return current ? sentenceAfter(current.end) : firstSentence(turnAt(here, 0))
      // with nothing selected, ↑ keeps its usual job of scrolling the page
      if (key === 'ArrowUp') return current ? sentenceBefore(current.start) : undefined
      if (key === ']') return firstSentence(turnAt(here, current ? 1 : 0))
      if (key === '[') return firstSentence(turnAt(here, -1))
      if (key === 't') return turnAt(here, 0)
      return undefined
    }
    if (!current) return undefined
    if (event.altKey) {
      if (key === 'ArrowLeft') return within(wordStep(text, current.start, -1), current.end)
      if (key === 'ArrowRight') return within(wordStep(text, current.start, 1), current.end)
      return undefined
    }
    if (key === 'ArrowDown') return within(current.start, sentenceAfter(current.end, true)?.end ?? current.end)
    if (key === 'ArrowUp') return within(current.start, sentenceBefore(current.end - 1)?.end ?? current.start)
    if (key === 'ArrowRight') return within(current.start, wordStep(text, current.end, 1))
    if (key === 'ArrowLeft') return within(current.start, wordStep(text, current.end, -1))
    return undefined
  }

  /** Moves the focus to the next (or previous) excerpt mark after the focused mark or the selection. */
  async function toMark(step: 1 | -1, current: Span | null): Promise<void> {
    const root = options.root.value
    if (!root) return
    await options.reveal(options.blocks().length - 1)
    const marks = [...root.querySelectorAll<HTMLElement>('button[data-excerpt]')]
    const focused = marks.indexOf(document.activeElement as HTMLElement)
    const at = current?.start ?? -1
    const index = focused >= 0 ? focused + step : step === 1 ? marks.findIndex((m) => Number(m.dataset.at) > at) : marks.filter((m) => Number(m.dataset.at) < at).length - 1
    const mark = marks[index]
    if (!mark) return
    mark.focus({ preventScroll: true })
    mark.scrollIntoView?.({ block: 'nearest' })
  }

  /** Handles a key pressed in the reading text; true when it was one of ours. */
  function handle(event: KeyboardEvent): boolean {
    const root = options.root.value
    if (!root || event.ctrlKey || event.metaKey) return false
    const current = selectedSpan(root)
    if (event.key.toLowerCase() === 'e' && !event.altKey) {
      event.preventDefault()
      void toMark(event.shiftKey ? -1 : 1, current)
      return true
    }
    if (event.key === 'Enter' || event.key === 'Escape') {
      // Enter on an excerpt mark is the mark's own (it shows the excerpt in the list).
      if (!current || (event.key === 'Enter' && event.target instanceof HTMLButtonElement)) return false
      if (event.key === 'Enter') options.onCode(current)
      else {
        document.getSelection()?.removeAllRanges()
        options.onClear()
      }
      event.preventDefault()
      return true
    }
    const next = target(event, current)
    if (next === undefined) return false
    event.preventDefault()
    void choose(next)
    return true
  }

  return { handle }
}

/** ? anywhere on the page (except while typing) opens the shortcuts help. */
export function useHelpKey(open: Ref<boolean>) {
  function onKey(event: KeyboardEvent): void {
    const target = event.target instanceof Element ? event.target : null
    if (event.key !== '?' || target?.closest('input, textarea, select, [contenteditable="true"]')) return
    event.preventDefault()
    open.value = true
  }
  onMounted(() => document.addEventListener('keydown', onKey))
  onBeforeUnmount(() => document.removeEventListener('keydown', onKey))
}
