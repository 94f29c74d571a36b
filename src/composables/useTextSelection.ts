import { onBeforeUnmount, onMounted, type Ref } from 'vue'

export interface TextSpan {
  start: number
  end: number
}

/** A DOM position as an offset into the transcript text, read from the `data-start` of the piece it falls in. */
function offsetOf(node: Node, offset: number): number | null {
  if (node.nodeType === Node.TEXT_NODE) {
    const start = node.parentElement?.dataset.start
    return start === undefined ? null : Number(start) + offset
  }
  if (!(node instanceof HTMLElement)) return null
  if (node.dataset.start !== undefined) return Number(node.dataset.start) + (offset === 0 ? 0 : (node.textContent ?? '').length)
  const child = node.childNodes[offset]
  const after = child instanceof HTMLElement ? (child.dataset.start !== undefined ? child : child.querySelector<HTMLElement>('[data-start]')) : null
  if (after) return Number(after.dataset.start)
  const pieces = node.querySelectorAll<HTMLElement>('[data-start]')
  const last = pieces[pieces.length - 1]
  return last ? Number(last.dataset.start) + (last.textContent ?? '').length : null
}

/**
 * Follows the reader's selection inside `root`, by mouse or keyboard (the selection changes either
 * way), and reports it as character offsets into the text, trimmed of surrounding spaces.
 */
export function useTextSelection(root: Ref<HTMLElement | null>, text: () => string, onSelect: (span: TextSpan) => void) {
  function check(): void {
    const selection = document.getSelection()
    if (!selection || selection.isCollapsed || !selection.rangeCount || !root.value) return
    const range = selection.getRangeAt(0)
    if (!root.value.contains(range.commonAncestorContainer)) return
    let start = offsetOf(range.startContainer, range.startOffset)
    let end = offsetOf(range.endContainer, range.endOffset)
    if (start === null || end === null) return
    const whole = text()
    while (start < end && /\s/.test(whole[start])) start += 1
    while (end > start && /\s/.test(whole[end - 1])) end -= 1
    if (end > start) onSelect({ start, end })
  }
  onMounted(() => document.addEventListener('selectionchange', check))
  onBeforeUnmount(() => document.removeEventListener('selectionchange', check))
  return { check }
}
