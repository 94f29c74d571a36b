import type { ConsentFormStatus, ConsentMethod, ParticipantConsentView, WithdrawalScope } from '@shared/schemas/consent'

/** Plain words for the consent codes: nobody reads a stored code. */
export const FORM_STATUS_WORDS: Record<ConsentFormStatus, string> = {
  draft: 'Draft',
  approved: 'Approved — in use',
  superseded: 'Replaced by a newer version',
}
export const FORM_STATUS_COLOURS: Record<ConsentFormStatus, string> = {
  draft: 'warning',
  approved: 'success',
  superseded: 'secondary',
}
export const METHOD_WORDS: Record<ConsentMethod, string> = {
  written: 'Signed paper form',
  verbal: 'Verbal, recorded by the team',
  electronic: 'Signed online (e-consent)',
}

type LinkStatus = ParticipantConsentView['links'][number]['status']
export const LINK_STATUS_WORDS: Record<LinkStatus, string> = {
  waiting: 'Waiting for a signature',
  used: 'Signed',
  expired: 'Expired unused',
  revoked: 'Cancelled',
}
export const LINK_STATUS_COLOURS: Record<LinkStatus, string> = {
  waiting: 'info',
  used: 'success',
  expired: 'secondary',
  revoked: 'secondary',
}

/** Staff wording of the two withdrawal choices. */
export const SCOPE_WORDS: Record<WithdrawalScope, string> = {
  stop_keep_data: 'Stop taking part, keep the data collected so far',
  withdraw_data: 'Withdraw my data',
}
/** The same two choices as a participant reads them on the public page. */
export const SCOPE_WORDS_FOR_PARTICIPANTS: Record<WithdrawalScope, string> = {
  stop_keep_data: 'Stop taking part. The team may keep what I have already shared.',
  withdraw_data: 'Stop taking part and remove what I have already shared.',
}

/** A clause answer always in words; an answer that is missing says so, never counts as a yes. */
export function answerWord(value: boolean | undefined): string {
  if (value === true) return 'Yes'
  if (value === false) return 'No'
  return 'No answer recorded'
}

/** A version key made from its wording: "May we record the interview?" → may_we_record_the_interview. */
export function keyFromWording(wording: string, taken: string[] = []): string {
  const words = wording
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9\s]/g, ' ')
    .split(/\s+/)
    .filter(Boolean)
  if (!/^[a-z]/.test(words[0] ?? '')) words.unshift('clause')
  // Whole words up to 36 characters, leaving room for a "_2" within the 40 a key may have.
  let key = words[0].slice(0, 36)
  for (const word of words.slice(1)) {
    if (key.length + 1 + word.length > 36) break
    key = `${key}_${word}`
  }
  let candidate = key
  for (let n = 2; taken.includes(candidate); n += 1) candidate = `${key}_${n}`
  return candidate
}
