import type { SamplingCharacteristic } from '../../../shared/schemas/recruitment.js'

/**
 * A participant's characteristics as readable label/value pairs, for the keys chosen to label quotes
 * (in that order); keys the study does not define or the participant has no value for are left out.
 */
export function characteristicLabels(
  definitions: readonly SamplingCharacteristic[],
  keys: readonly string[],
  characteristics: Record<string, string> | null | undefined,
): { label: string; value: string }[] {
  return keys.flatMap((key) => {
    const definition = definitions.find((d) => d.key === key)
    const value = characteristics?.[key]
    if (!definition || value === undefined) return []
    return [{ label: definition.label, value: definition.values.find((v) => v.value === value)?.label ?? value }]
  })
}
