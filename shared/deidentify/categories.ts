// The identifier categories the scanner flags. They follow the HIPAA Safe Harbor list,
// 45 CFR 164.514(b)(2)(i)(A)–(R), minus the ones a transcript cannot carry as text
// (biometrics, full-face photographs); "other-id" stands for (R), any other unique number or code.

export const IDENTIFIER_CATEGORIES = [
  'name',
  'location',
  'date',
  'age',
  'phone',
  'fax',
  'email',
  'ssn',
  'record-number',
  'health-plan-number',
  'account-number',
  'licence-number',
  'vehicle-id',
  'device-id',
  'url',
  'ip-address',
  'other-id',
] as const

export type IdentifierCategory = (typeof IDENTIFIER_CATEGORIES)[number]

/**
 * One suspected identifier. `start` and `end` are JavaScript string indices into the scanned
 * text — UTF-16 code units, end exclusive — so `text.slice(start, end) === flag.text`.
 * An emoji before the span counts as two units, exactly as `String.prototype.slice` counts it.
 */
export interface Flag {
  start: number
  end: number
  category: IdentifierCategory
  text: string
}

/** A flag before overlaps are resolved; `rank` says how specific the detector is (higher wins). */
export interface Candidate extends Flag {
  rank: number
}

export function candidate(text: string, start: number, end: number, category: IdentifierCategory, rank: number): Candidate {
  return { start, end, category, rank, text: text.slice(start, end) }
}
