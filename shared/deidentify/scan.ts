// The assisted scanner: suggests spans that may identify a participant. A person reviews every flag
// and reads the whole transcript; the scanner misses things (see README.md).
import type { CountryCode } from 'libphonenumber-js'
import type { Flag, IdentifierCategory } from './categories.js'
import { detectAgesOver89, detectDates } from './detectors/dates.js'
import { detectLabelledNumbers } from './detectors/labelled.js'
import {
  detectEmails, detectIpAddresses, detectLongNumbers, detectPostalCodes, detectSsns, detectStudyTerms, detectUrls,
} from './detectors/patterns.js'
import { detectHonorificNames, detectStreetAddresses } from './detectors/addresses.js'
import { detectPeopleAndPlaces } from './detectors/people-places.js'
import { detectPhones } from './detectors/phones.js'
import { resolveOverlaps } from './merge.js'

export type { Flag, IdentifierCategory } from './categories.js'
export type { CountryCode } from 'libphonenumber-js'

export interface ScanOptions {
  /** The team's own list (participant's name, town, ward…): exact, case-insensitive, whole-word matches. */
  studyTerms?: { term: string; category: IdentifierCategory }[]
  /** Country for numbers written without an international prefix; defaults to 'US'. */
  defaultCountry?: CountryCode
}

/**
 * Flags suspected identifiers in `text`. Offsets are JavaScript string indices (UTF-16 code units,
 * end exclusive), so `text.slice(flag.start, flag.end) === flag.text`. Flags are sorted by start and
 * never overlap: where detectors disagree the more specific one wins, then the longer span.
 */
export function scanForIdentifiers(text: string, options: ScanOptions = {}): Flag[] {
  const candidates = [
    ...detectStudyTerms(text, options.studyTerms ?? []),
    ...detectLabelledNumbers(text),
    ...detectEmails(text),
    ...detectUrls(text),
    ...detectIpAddresses(text),
    ...detectSsns(text),
    ...detectPhones(text, options.defaultCountry ?? 'US'),
    ...detectDates(text),
    ...detectPostalCodes(text),
    ...detectAgesOver89(text),
    ...detectHonorificNames(text),
    ...detectStreetAddresses(text),
    ...detectLongNumbers(text),
    ...detectPeopleAndPlaces(text),
  ]
  return resolveOverlaps(candidates, text)
}
