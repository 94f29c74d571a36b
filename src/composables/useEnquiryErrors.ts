import { reactive, ref } from 'vue'
import type { Contact } from '@shared/schemas/recruitment'
import { ApiError } from '@/api/errors'
import { useNotificationsStore } from '@/stores/notifications'

export type ContactField = keyof Contact
export type ContactErrors = Record<ContactField, string[]>
const CONTACT_FIELDS: ContactField[] = ['name', 'email', 'phone', 'country', 'timeZone']

/**
 * Server errors for an enquiry or screening form: `answers.<question id>` goes under that question,
 * `contact.<field>` under the contact field, `consentToContact` under the tick box; the rest to the snackbar.
 */
export function useEnquiryErrors() {
  const notifications = useNotificationsStore()
  const answers = ref<Record<string, string[]>>({})
  const contact = reactive(Object.fromEntries(CONTACT_FIELDS.map((f) => [f, [] as string[]]))) as ContactErrors
  const consent = ref<string[]>([])

  function clear(): void {
    answers.value = {}
    for (const field of CONTACT_FIELDS) contact[field] = []
    consent.value = []
  }

  function place(path: string, message: string): boolean {
    const [head, field] = path.split(/[./]/).filter(Boolean)
    if (head === 'answers' && field) {
      answers.value = { ...answers.value, [field]: [...(answers.value[field] ?? []), message] }
      return true
    }
    if (head === 'contact' && CONTACT_FIELDS.includes(field as ContactField)) {
      contact[field as ContactField].push(message)
      return true
    }
    if (head === 'consentToContact') {
      consent.value.push(message)
      return true
    }
    return false
  }

  function show(error: unknown): void {
    clear()
    if (error instanceof ApiError && error.errors.length) {
      const rest = error.errors.filter((problem) => !place(problem.path, problem.message)).map((problem) => problem.message)
      if (rest.length) notifications.failure(rest.join(' '))
      return
    }
    notifications.failure(error)
  }

  return { answers, contact, consent, clear, show }
}
