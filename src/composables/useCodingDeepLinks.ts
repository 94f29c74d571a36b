import { watch } from 'vue'
import { useRoute } from 'vue-router'

/**
 * `?at=<offset>` scrolls to the turn holding that offset and lights it up for a moment;
 * `?excerpt=<id>` chooses that excerpt. Each link is followed once, when what it needs has loaded.
 */
export function useCodingDeepLinks(options: {
  textReady: () => boolean
  excerptsReady: () => boolean
  showOffset: (offset: number) => void
  showExcerpt: (id: string) => boolean
  missingExcerpt: () => void
}) {
  const route = useRoute()
  const single = (value: unknown) => (typeof value === 'string' ? value : Array.isArray(value) && typeof value[0] === 'string' ? value[0] : null)
  let followedAt: string | null = null
  let followedExcerpt: string | null = null

  watch(
    [() => single(route.query.at), options.textReady],
    ([at, ready]) => {
      if (!at || !ready || at === followedAt || !/^\d+$/.test(at)) return
      followedAt = at
      options.showOffset(Number(at))
    },
    { immediate: true, flush: 'post' },
  )

  watch(
    [() => single(route.query.excerpt), options.textReady, options.excerptsReady],
    ([id, textReady, excerptsReady]) => {
      if (!id || !textReady || !excerptsReady || id === followedExcerpt) return
      followedExcerpt = id
      if (!options.showExcerpt(id)) options.missingExcerpt()
    },
    { immediate: true, flush: 'post' },
  )
}
