import { computed, ref, watch, type Ref } from 'vue'
import type { Excerpt } from '@shared/schemas/coding'
import { readingBlocks } from '@shared/coding/segments'
import { useCodebookQuery } from '@/api/codebook'
import { useCodingSettingsMutation, useCodingSettingsQuery, useExcerptsQuery, useOtherCodingQuery } from '@/api/coding'
import { useReadingQuery } from '@/api/transcripts'
import { useNotificationsStore } from '@/stores/notifications'

const byPlace = (a: Excerpt, b: Excerpt) => a.start - b.start || a.end - b.end

/**
 * What the coding view reads: the approved text cut into blocks, the codebook, your excerpts in
 * reading order, and, when comparing, another coder's. The lead's comparison switch lives here too.
 */
export function useCodingData(studyId: Ref<string>, transcriptId: Ref<string>, canSettle: Ref<boolean>) {
  const notifications = useNotificationsStore()
  const reading = useReadingQuery(studyId, transcriptId)
  const codebook = useCodebookQuery(studyId)
  const mine = useExcerptsQuery(studyId, transcriptId)
  const otherCoderId = ref<string | null>(null)
  const theirs = useOtherCodingQuery(studyId, transcriptId, otherCoderId)
  const settings = useCodingSettingsQuery(studyId, canSettle)
  const savingSettings = useCodingSettingsMutation(studyId)

  const text = computed(() => reading.data.value?.text ?? '')
  const blocks = computed(() => (reading.data.value ? readingBlocks(reading.data.value.text, reading.data.value.turns) : []))
  const codes = computed(() => codebook.data.value ?? [])
  const own = computed(() => [...(mine.data.value?.excerpts ?? [])].sort(byPlace))
  const other = computed(() => (otherCoderId.value ? [...(theirs.data.value?.excerpts ?? [])].sort(byPlace) : []))
  const otherName = computed(() => (otherCoderId.value ? (mine.data.value?.coders.find((c) => c.id === otherCoderId.value)?.name ?? 'Another coder') : null))
  const excerptsReady = computed(() => Boolean(mine.data.value) || Boolean(mine.error.value))
  const noCodes = computed(() => Boolean(codebook.data.value) && !codes.value.some((c) => c.status === 'active'))
  const comparisonSetting = computed(() => (canSettle.value ? (settings.data.value?.coderComparison ?? null) : null))

  // Comparison switched off meanwhile, or the other coder's list refused: back to your own coding alone.
  watch(
    () => mine.data.value?.comparisonAllowed,
    (allowed) => {
      if (allowed === false) otherCoderId.value = null
    },
  )
  watch(theirs.error, (error) => {
    if (!error || !otherCoderId.value) return
    notifications.failure(error)
    otherCoderId.value = null
  })

  async function toggleComparison(on: boolean): Promise<void> {
    try {
      await savingSettings.mutateAsync({ coderComparison: on })
      notifications.success(on ? 'Coders can now show each other’s coding.' : 'Coders now see only their own coding.')
      if (!on) otherCoderId.value = null
    } catch (error) {
      notifications.failure(error)
    }
  }

  return { reading, mine, otherCoderId, text, blocks, codes, own, other, otherName, excerptsReady, noCodes, comparisonSetting, savingSettings, toggleComparison }
}
