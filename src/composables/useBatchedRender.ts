import { nextTick, onBeforeUnmount, ref, watch } from 'vue'

/**
 * Long lists render their first `first` items at once and the rest in batches while the browser is
 * idle, so the first screen appears quickly. `reveal(index)` renders through an item at once.
 */
export function useBatchedRender(total: () => number, first = 40, batch = 80) {
  const shown = ref(0)
  let timer: number | ReturnType<typeof setTimeout> | null = null
  const idle = (work: () => void) => ('requestIdleCallback' in window ? window.requestIdleCallback(work, { timeout: 200 }) : setTimeout(work, 16))

  function schedule(): void {
    if (timer !== null || shown.value >= total()) return
    timer = idle(() => {
      timer = null
      shown.value = Math.min(total(), shown.value + batch)
      schedule()
    })
  }

  watch(
    total,
    (count) => {
      shown.value = Math.min(count, Math.max(shown.value, first))
      schedule()
    },
    { immediate: true },
  )

  onBeforeUnmount(() => {
    if (timer === null) return
    if (typeof timer === 'number' && 'cancelIdleCallback' in window) window.cancelIdleCallback(timer)
    clearTimeout(timer as ReturnType<typeof setTimeout>)
    timer = null
  })

  async function reveal(index: number): Promise<void> {
    if (index < shown.value) return
    shown.value = Math.min(total(), index + 1 + batch)
    await nextTick()
    schedule()
  }

  return { shown, reveal }
}
