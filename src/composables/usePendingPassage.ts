import { ref, type Ref } from 'vue'
import { normaliseRange } from '@shared/coding/offsets'
import type { Span } from '@shared/coding/segments'

/** What the view needs of the reading text and the code panel to place and focus them. */
interface TextHandle {
  paint: (kind: 'pending', span: Span | null) => void
  focus: () => void
}

/**
 * The passage waiting for codes: snapped and trimmed (shared/coding/offsets.ts), painted in the text,
 * with the code panel placed just under the selection's last line. A mouse selection takes the focus
 * into the panel; a keyboard one leaves it in the text until Enter, so the reader can keep adjusting.
 */
export function usePendingPassage(text: Ref<string>, canWrite: Ref<boolean>, textView: Readonly<Ref<TextHandle | null>>, column: Readonly<Ref<HTMLElement | null>>, panel: Readonly<Ref<{ focus: () => void } | null>>) {
  const pending = ref<{ span: Span; quote: string; top: number; left: number; focus: boolean } | null>(null)

  function select(raw: Span, anchor: DOMRect | null, via: 'mouse' | 'keyboard'): void {
    const span = normaliseRange(text.value, raw.start, raw.end)
    if (!span || !canWrite.value) return
    const box = column.value?.getBoundingClientRect()
    const top = anchor && box ? anchor.bottom - box.top + 8 : 0
    const left = anchor && box ? Math.max(0, Math.min(anchor.left - box.left, box.width - 380)) : 0
    pending.value = { span, quote: text.value.slice(span.start, span.end), top, left, focus: via === 'mouse' }
    textView.value?.paint('pending', span)
  }

  function code(span: Span): void {
    const open = pending.value
    if (!open || open.span.start !== span.start || open.span.end !== span.end) select(span, null, 'keyboard')
    if (pending.value) pending.value.focus = true
    panel.value?.focus()
  }

  function close(returnFocus: boolean): void {
    pending.value = null
    textView.value?.paint('pending', null)
    if (returnFocus) textView.value?.focus()
  }

  return { pending, select, code, close }
}
