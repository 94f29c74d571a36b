import type { IdentifierCategory } from '@shared/deidentify/categories'
import type { Flag, Interview, TranscriptStatus } from '@shared/schemas/interviews'

/** Plain words for the interview and transcript codes: nobody reads a stored code. */
export const MODE_WORDS: Record<Interview['mode'], string> = {
  video: 'Video call',
  phone: 'Phone',
  in_person: 'In person',
}
export const INTERVIEW_STATUS_WORDS: Record<Interview['status'], string> = {
  scheduled: 'Booked',
  done: 'Done',
  missed: 'Did not take place',
  cancelled: 'Cancelled',
}
export const INTERVIEW_STATUS_COLOURS: Record<Interview['status'], string> = {
  scheduled: 'info',
  done: 'success',
  missed: 'warning',
  cancelled: 'secondary',
}
export const TRANSCRIPT_STATUS_WORDS: Record<TranscriptStatus, string> = {
  in_review: 'Being de-identified',
  approved: 'Approved for coding',
  rejected: 'Rejected — upload deleted',
}
export const TRANSCRIPT_STATUS_COLOURS: Record<TranscriptStatus, string> = {
  in_review: 'warning',
  approved: 'success',
  rejected: 'secondary',
}
export const CATEGORY_WORDS: Record<IdentifierCategory, string> = {
  name: 'Name',
  location: 'Place',
  date: 'Date',
  age: 'Age over 89',
  phone: 'Phone number',
  fax: 'Fax number',
  email: 'E-mail address',
  ssn: 'Social security number',
  'record-number': 'Medical record number',
  'health-plan-number': 'Health plan number',
  'account-number': 'Account number',
  'licence-number': 'Licence number',
  'vehicle-id': 'Vehicle identifier',
  'device-id': 'Device identifier',
  url: 'Web address',
  'ip-address': 'IP address',
  'other-id': 'Other identifying number',
}
export const categoryWord = (category: string): string => CATEGORY_WORDS[category as IdentifierCategory] ?? category

export const DECISION_WORDS: Record<Flag['decision'], string> = {
  pending: 'to decide',
  accepted: 'will be replaced',
  rejected: 'kept as written',
}
export const SOURCE_WORDS: Record<Flag['source'], string> = {
  scanner: 'Found by the scan',
  manual: 'Selected by hand',
  'study-term': 'Accepted everywhere',
}

/** A turn's start as h:mm:ss (or m:ss under an hour); null when the transcript has no times. */
export function clockOf(ms: number | null): string | null {
  if (ms === null) return null
  const total = Math.floor(ms / 1000)
  const h = Math.floor(total / 3600)
  const m = Math.floor((total % 3600) / 60)
  const s = String(total % 60).padStart(2, '0')
  return h ? `${h}:${String(m).padStart(2, '0')}:${s}` : `${m}:${s}`
}
