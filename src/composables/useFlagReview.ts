import { useQueryCache } from '@pinia/colada'
import { computed, ref, toValue, type MaybeRefOrGetter } from 'vue'
import type { Flag, FlagDecisions } from '@shared/schemas/interviews'
import { saveDecisions, transcriptKeys, useReviewQuery } from '@/api/transcripts'
import { useNotificationsStore } from '@/stores/notifications'

type Decision = Flag['decision']

/**
 * The review's flags with each decision saved as it is made. A decision shows at once (optimistic);
 * saves go to the server one after another so answers cannot overtake each other, and a refused save
 * puts the earlier decision back and says so in the snackbar.
 */
export function useFlagReview(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  const notifications = useNotificationsStore()
  const review = useReviewQuery(studyId, transcriptId)
  const shown = ref<Record<string, Decision>>({})
  const saving = ref(0)
  let queue: Promise<unknown> = Promise.resolve()

  const flags = computed<Flag[]>(() =>
    [...(review.data.value?.flags ?? [])]
      .map((flag) => (flag.id in shown.value ? { ...flag, decision: shown.value[flag.id] } : flag))
      .sort((a, b) => a.start - b.start || b.end - a.end),
  )
  const pending = computed(() => flags.value.filter((f) => f.decision === 'pending').length)

  async function save(body: Partial<FlagDecisions>): Promise<boolean> {
    saving.value += 1
    const step = queue.then(() => saveDecisions(toValue(studyId), toValue(transcriptId), body))
    queue = step.catch(() => undefined)
    try {
      const answer = await step
      queryCache.setQueryData(transcriptKeys.review(toValue(studyId), toValue(transcriptId)), answer)
      return true
    } catch (error) {
      notifications.failure(error)
      return false
    } finally {
      saving.value -= 1
    }
  }

  async function decide(changes: { id: string; decision: Decision }[]): Promise<void> {
    if (!changes.length) return
    shown.value = { ...shown.value, ...Object.fromEntries(changes.map((c) => [c.id, c.decision])) }
    await save({ decisions: changes })
    // Saved or refused, the server's answer is now the truth, unless a later click on the same flag is still on its way.
    const next = { ...shown.value }
    for (const change of changes) if (next[change.id] === change.decision) delete next[change.id]
    shown.value = next
  }

  const acceptEverywhere = (term: string, category: string) => save({ acceptEverywhere: [{ term, category }] })
  const redact = (start: number, end: number, category: string) => save({ manual: [{ start, end, category }] })
  const acceptRemaining = () => decide(flags.value.filter((f) => f.decision === 'pending').map((f) => ({ id: f.id, decision: 'accepted' as const })))

  return { review, flags, pending, saving: computed(() => saving.value > 0), decide, acceptEverywhere, redact, acceptRemaining }
}
