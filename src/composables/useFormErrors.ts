import { reactive } from 'vue'
import { ApiError } from '@/api/errors'
import { useNotificationsStore } from '@/stores/notifications'

/**
 * Server validation errors for one form: each `{ path, message }` whose path names a field of the
 * form goes under that field; everything else goes to the snackbar queue.
 */
export function useFormErrors<F extends string>(fields: readonly F[]) {
  const notifications = useNotificationsStore()
  const errors = reactive(Object.fromEntries(fields.map((f) => [f, [] as string[]]))) as Record<F, string[]>

  function clear(): void {
    for (const field of fields) errors[field] = []
  }

  function fieldOf(path: string): F | undefined {
    const parts = path.split(/[./]/).filter(Boolean)
    return [...parts].reverse().find((part): part is F => (fields as readonly string[]).includes(part))
  }

  /** Shows a failed call's messages; returns the error for callers that want to look at it. */
  function show(error: unknown): unknown {
    clear()
    if (error instanceof ApiError && error.errors.length) {
      const rest: string[] = []
      for (const problem of error.errors) {
        const field = fieldOf(problem.path)
        if (field) errors[field].push(problem.message)
        else rest.push(problem.message)
      }
      if (rest.length) notifications.failure(rest.join(' '))
      return error
    }
    notifications.failure(error)
    return error
  }

  return { errors, clear, show }
}
