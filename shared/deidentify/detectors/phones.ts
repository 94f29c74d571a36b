// Telephone and fax numbers — Safe Harbor (D) and (E) — found by libphonenumber-js.
import { findPhoneNumbersInText, type CountryCode } from 'libphonenumber-js'
import { candidate, type Candidate } from '../categories.js'
import { RANK } from './patterns.js'

// Words that announce a number as a phone number (common practice).
const PHONE_CUE = /\b(?:phone[ds]?|tel|telephone|call(?:ed|ing)?|ring(?:s|ing)?|rang|mobile|cell|landline|number|no\.|text(?:ed)?|line|dial(?:led)?|reach(?:ed)?|contact)\b/i
const FAX_CUE = /\bfax(?:ed|es|ing)?\b/i
const CUE_WINDOW = 40

/**
 * libphonenumber-js in its lenient mode finds every dialable-looking number. A match is kept when
 * it is a valid number for its country, is written in international form (+…), or has a phone word
 * shortly before it; otherwise long digit runs are left to the other detectors. Fiction-reserved
 * ranges (555-01xx, 01632 960xxx, 07700 900xxx) are "possible" but not "valid", so they need the cue.
 */
export function detectPhones(text: string, defaultCountry: CountryCode): Candidate[] {
  const found: Candidate[] = []
  let previousEnd = 0
  for (const match of findPhoneNumbersInText(text, { defaultCountry, extended: true })) {
    // The matcher may run on past a comma into the next number ("0161 496 0000, 212"); cut there.
    const raw = text.slice(match.startsAt, match.endsAt)
    const cut = raw.search(/[,;]/)
    const end = cut === -1 ? match.endsAt : match.startsAt + raw.slice(0, cut).trimEnd().length
    const digits = (text.slice(match.startsAt, end).match(/\d/g) ?? []).length
    if (digits < 7) continue
    const before = text.slice(Math.max(previousEnd, match.startsAt - CUE_WINDOW), match.startsAt)
    const fax = FAX_CUE.test(before)
    const keep = cut === -1 && match.number.isValid() || raw.startsWith('+') || fax || PHONE_CUE.test(before)
    if (!keep) continue
    found.push(candidate(text, match.startsAt, end, fax ? 'fax' : 'phone', RANK.phone))
    previousEnd = end
  }
  return found
}
