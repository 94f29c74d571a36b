import { ref } from 'vue'
import { ApiError } from '@/api/errors'

/**
 * Field errors on clause answers (`clauses.<key>`) go under that clause's Yes / No pair; the rest of
 * the problem is handed back for the form's own fields.
 */
export function useClauseErrors() {
  const clauseErrors = ref<Record<string, string[]>>({})

  function take(error: unknown): unknown {
    clauseErrors.value = {}
    if (!(error instanceof ApiError) || !error.errors.length) return error
    const rest: { path: string; message: string }[] = []
    for (const problem of error.errors) {
      const [field, key] = problem.path.split(/[./]/).filter(Boolean)
      if (field === 'clauses' && key) clauseErrors.value = { ...clauseErrors.value, [key]: [...(clauseErrors.value[key] ?? []), problem.message] }
      else rest.push(problem)
    }
    if (!rest.length && Object.keys(clauseErrors.value).length) return null
    return new ApiError({ type: error.type, title: error.title, status: error.status, detail: error.detail, errors: rest })
  }

  return { clauseErrors, take }
}
