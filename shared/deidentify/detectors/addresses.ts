// Two patterns compromise does not cover: an honorific before a name ("Dr Okafor", "Mrs. Lind") and
// street addresses ("22 Quayside Lane", "Orrin Cottage, Greyholt") — Safe Harbor (A) and (B).
import { candidate, type Candidate } from '../categories.js'
import { RANK } from './patterns.js'

const HONORIFIC = /\b(?:Dr|Doctor|Mr|Mrs|Ms|Miss|Mx|Prof|Professor|Nurse|Sister|Matron|Rev|Father|Aunt|Auntie|Uncle)\.?\s+(?:[A-Z][\p{L}’'-]*\p{L}|[A-Z]\.)(?:\s+[A-Z][\p{L}’'-]*\p{L})?/gu
const STREET_TYPES = 'Street|St|Road|Rd|Avenue|Ave|Lane|Ln|Drive|Close|Crescent|Way|Court|Ct|Place|Terrace|Boulevard|Blvd|Row|Gardens|Cottage|Farm'
// Optional house number, one to three capitalised words, a street type, then an optional ", Town".
const STREET = new RegExp(
  `\\b(?:\\d{1,5}[A-Za-z]?\\s+)?(?:[A-Z][a-z]+\\s+){1,3}(?:${STREET_TYPES})\\b(?:,\\s+[A-Z][a-z]+(?:\\s+[A-Z][a-z]+)?\\b)?`,
  'g',
)
// Words that open a sentence or a phrase, not a street name ("On Heron Street" → "Heron Street").
const NOT_NAME_START = /^(?:The|A|An|On|In|At|To|From|Near|Our|My|His|Her|Their|We|I|Off|By|Down|Up|Along)\s+/
const POSSESSIVE = /['’]s$/

export function detectHonorificNames(text: string): Candidate[] {
  return [...text.matchAll(HONORIFIC)].map((m) => {
    const end = m.index + m[0].replace(POSSESSIVE, '').length
    return candidate(text, m.index, end, 'name', RANK.honorific)
  })
}

export function detectStreetAddresses(text: string): Candidate[] {
  return [...text.matchAll(STREET)]
    .map((m) => {
      const lead = NOT_NAME_START.exec(m[0])?.[0].length ?? 0
      return candidate(text, m.index + lead, m.index + m[0].length, 'location', RANK.street)
    })
    .filter((f) => /\s/.test(f.text))
}
