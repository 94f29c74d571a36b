import type { z } from 'zod'

type Rule = (value: unknown) => true | string

/** Vuetify field rules built from the same zod schema the server validates with. */
export function useFieldRules() {
  function fromSchema(schema: z.ZodType): Rule {
    return (value) => {
      const result = schema.safeParse(value)
      return result.success || (result.error.issues[0]?.message ?? 'Check this field.')
    }
  }
  const required =
    (label: string): Rule =>
    (value) =>
      (typeof value === 'string' ? value.trim().length > 0 : value != null) || `${label} is required.`
  return { fromSchema, required }
}
