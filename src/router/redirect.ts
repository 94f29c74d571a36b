/** Only paths inside the app are followed after sign-in (never `//elsewhere.example`). */
export function safeRedirect(value: unknown): string | null {
  return typeof value === 'string' && value.startsWith('/') && !value.startsWith('//') ? value : null
}
