import { computed, type Ref } from 'vue'
import { useStudyQuery } from '@/api/studies'
import { useSessionStore } from '@/stores/session'

/** The title of the current study: from the person's memberships, or fetched (a site administrator may not be a member). */
export function useStudyTitle(studyId: Ref<string>) {
  const session = useSessionStore()
  const membership = computed(() => session.membershipIn(studyId.value))
  const { data } = useStudyQuery(() => (studyId.value && !membership.value ? studyId.value : undefined))
  return computed(() => membership.value?.studyTitle ?? data.value?.title ?? '')
}
