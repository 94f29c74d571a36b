import { computed } from 'vue'
import { useRoute } from 'vue-router'

/** The study the current page is about, from the `:studyId` route parameter. */
export function useStudyId() {
  const route = useRoute()
  return computed(() => {
    const value = route.params.studyId
    return typeof value === 'string' ? value : ''
  })
}
