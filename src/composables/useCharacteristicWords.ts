import type { Ref } from 'vue'
import { useRecruitmentSettingsQuery } from '@/api/recruitment'

/** A participant's sampling characteristics in the study's own labels ("Region: North"), falling back to the stored keys. */
export function useCharacteristicWords(studyId: Ref<string>) {
  const { data } = useRecruitmentSettingsQuery(studyId)

  function describe(characteristics: Record<string, string>): string {
    const defined = data.value?.samplingCharacteristics ?? []
    return Object.entries(characteristics)
      .map(([key, value]) => {
        const characteristic = defined.find((c) => c.key === key)
        const label = characteristic?.values.find((v) => v.value === value)?.label ?? value
        return `${characteristic?.label ?? key}: ${label}`
      })
      .join(' · ')
  }

  return { describe, settings: data }
}
