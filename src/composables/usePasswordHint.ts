import { computed, type Ref } from 'vue'
import { codePointLength, normalisePassword, passwordProblems, PASSWORD_MIN_CODE_POINTS } from '@shared/passwords/policy'

/**
 * The live length hint for a new password. Only the length rule runs here: the list of commonly
 * used passwords stays on the server, which checks it when the form is sent.
 */
export function usePasswordHint(password: Ref<string>) {
  const length = computed(() => codePointLength(normalisePassword(password.value)))
  const longEnough = computed(() => length.value >= PASSWORD_MIN_CODE_POINTS)
  const hint = computed(() =>
    longEnough.value
      ? `Long enough (${length.value} characters).`
      : `Use at least ${PASSWORD_MIN_CODE_POINTS} characters: ${length.value} so far. A few unrelated words are easy to remember.`,
  )
  const rule = (value: unknown) => passwordProblems({ password: String(value ?? '') })[0] ?? true
  return { hint, longEnough, rule }
}
