// Small regular expressions for the structured categories: e-mail, URL, IP, SSN, postal codes,
// long numbers. Each returns candidates with a rank (see ../merge.ts).
import { candidate, type Candidate, type IdentifierCategory } from '../categories.js'

// How specific each detector is; where flags of different categories overlap the higher rank wins.
// E-mail, URL and IP addresses outrank the team's terms because they contain them whole.
export const RANK = {
  email: 95, url: 94, ip: 93, labelled: 90, studyTerm: 88, ssn: 75, phone: 70, date: 60, postal: 55, age: 50,
  honorific: 45, street: 45, otherId: 40, introducedName: 38, placeAfterPreposition: 35, nlp: 30,
} as const

function collect(text: string, pattern: RegExp, category: IdentifierCategory, rank: number, group = 0): Candidate[] {
  const found: Candidate[] = []
  for (const m of text.matchAll(pattern)) {
    const start = m.index + (group === 0 ? 0 : m[0].indexOf(m[group]))
    found.push(candidate(text, start, start + m[group].length, category, rank))
  }
  return found
}

/** Trailing sentence punctuation is not part of a URL or address. */
function trimTrailing(flags: Candidate[], text: string): Candidate[] {
  return flags.map((f) => {
    let end = f.end
    while (end > f.start && /[.,;:!?)\]'"’]/.test(text[end - 1])) end--
    return candidate(text, f.start, end, f.category, f.rank)
  })
}

const EMAIL = /(?<![\w.+-])[\w.+-]+@[A-Za-z0-9-]+(?:\.[A-Za-z0-9-]+)*\.[A-Za-z]{2,}/g
const URL_EXPLICIT = /\b(?:https?:\/\/|www\.)[^\s<>"]+/gi
// Bare domains ("example.org/carers") on common top-level domains (common practice).
const URL_BARE = /(?<![@\w.-])[a-z0-9-]+(?:\.[a-z0-9-]+)*\.(?:org|com|net|edu|gov|info|io|co\.uk|org\.uk|nhs\.uk|ca)\b(?:\/[^\s<>"]*)?/gi
const OCTET = '(?:25[0-5]|2[0-4]\\d|1\\d\\d|[1-9]?\\d)'
const IPV4 = new RegExp(`(?<![\\d.])${OCTET}(?:\\.${OCTET}){3}(?![\\d]|\\.\\d)`, 'g')
// IPv6: eight full groups, or a compressed form with "::" (clock times never contain "::").
const IPV6 = /(?<![\w:])(?:(?:[0-9a-f]{1,4}:){7}[0-9a-f]{1,4}|(?:[0-9a-f]{1,4}:){1,6}:(?:[0-9a-f]{1,4}(?::[0-9a-f]{1,4}){0,5})?)(?![\w:])/gi
// Area 000 and 666, group 00 and serial 0000 were never issued (SSA numbering rules, common practice).
const SSN = /(?<![\w-])(?!000|666)\d{3}([- ])(?!00)\d{2}\1(?!0000)\d{4}(?![\w-])/g
const US_ZIP = /(?<![\w$£€.,/-])\d{5}(?:-\d{4})?(?![\w%/-]|[.,]\d)/g
const UK_POSTCODE = /\b[A-Z]{1,2}\d[A-Z\d]? ?\d[ABD-HJLNP-UW-Z]{2}\b/g
const CA_POSTAL = /\b[ABCEGHJ-NPRSTVXY]\d[ABCEGHJ-NPRSTV-Z] ?\d[ABCEGHJ-NPRSTV-Z]\d\b/g
// Six or more digits, alone or in groups split by single spaces, hyphens or slashes, optional letter affixes.
const LONG_NUMBER = /(?<![\w/-])(?:[A-Z]{1,4}[-/]?)?\d(?:[ /-]?\d)*[A-Z]?(?![\w/-])/g

export function detectEmails(text: string): Candidate[] {
  return collect(text, EMAIL, 'email', RANK.email)
}

export function detectUrls(text: string): Candidate[] {
  return trimTrailing([...collect(text, URL_EXPLICIT, 'url', RANK.url), ...collect(text, URL_BARE, 'url', RANK.url - 1)], text)
}

export function detectIpAddresses(text: string): Candidate[] {
  const v6 = collect(text, IPV6, 'ip-address', RANK.ip).filter((f) => /[a-f]/i.test(f.text) || f.text.split(':').length > 3)
  return [...collect(text, IPV4, 'ip-address', RANK.ip), ...v6]
}

/** NNN-NN-NNNN or NNN NN NNNN; nine bare digits count only after an SSN label (see labelled.ts). */
export function detectSsns(text: string): Candidate[] {
  return collect(text, SSN, 'ssn', RANK.ssn)
}

export function detectPostalCodes(text: string): Candidate[] {
  return [
    ...collect(text, US_ZIP, 'location', RANK.postal),
    ...collect(text, UK_POSTCODE, 'location', RANK.postal),
    ...collect(text, CA_POSTAL, 'location', RANK.postal),
  ]
}

export function detectLongNumbers(text: string): Candidate[] {
  return collect(text, LONG_NUMBER, 'other-id', RANK.otherId).filter((f) => (f.text.match(/\d/g) ?? []).length >= 6)
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
}

/** The team's own list: exact, case-insensitive, whole-word; any run of spaces matches any whitespace. */
export function detectStudyTerms(text: string, terms: { term: string; category: IdentifierCategory }[]): Candidate[] {
  const found: Candidate[] = []
  for (const { term, category } of terms) {
    // Match the term as composed (NFC) and decomposed (NFD), whichever form the transcript uses.
    for (const form of new Set([term.normalize('NFC'), term.normalize('NFD')])) {
      const words = form.trim().split(/\s+/).filter(Boolean)
      if (words.length === 0) continue
      const body = words.map(escapeRegExp).join('\\s+')
      const pattern = new RegExp(`(?<![\\p{L}\\p{M}\\p{N}_])${body}(?![\\p{L}\\p{M}\\p{N}_])`, 'giu')
      found.push(...collect(text, pattern, category, RANK.studyTerm))
    }
  }
  return found
}
