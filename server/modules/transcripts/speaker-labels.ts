/** Role labels that identify nobody and are kept as they are (common practice in transcripts). */
const ROLE_LABEL = /^(interviewer|researcher|moderator|facilitator|interpreter|note[- ]?taker|unknown|speaker\s*\d*|i|r|p|q|a)\b/i

/**
 * Speaker labels must not carry names into the de-identified transcript: a label with any part of the
 * participant's name becomes their pseudonym, and accepted terms inside other labels become their
 * placeholders. Role labels ("Interviewer") stay.
 */
export function deidentifySpeaker(label: string, context: { pseudonym: string; nameParts: string[]; replacements: { term: string; placeholder: string }[] }): string {
  const trimmed = label.trim()
  if (ROLE_LABEL.test(trimmed) && trimmed.split(/\s+/).length <= 2 && !context.nameParts.some((part) => trimmed.toLowerCase().includes(part))) return trimmed
  const lower = trimmed.toLowerCase()
  if (context.nameParts.some((part) => lower.includes(part))) return context.pseudonym
  let result = trimmed
  for (const { term, placeholder } of context.replacements) {
    if (!term.trim()) continue
    result = result.replace(new RegExp(term.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'), 'gi'), placeholder)
  }
  return result
}
