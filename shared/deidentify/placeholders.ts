// Consistent bracketed placeholders across a study, and applying chosen redactions to a transcript.
// UK Data Service, Anonymising qualitative data: replace rather than blank out, keep replacements
// consistent across the study, mark them visibly, and keep a log of every change.
import type { IdentifierCategory } from './categories.js'

export const PLACEHOLDER_LABELS: Record<IdentifierCategory, string> = {
  name: 'NAME', location: 'PLACE', date: 'DATE', age: 'AGE', phone: 'PHONE', fax: 'FAX', email: 'EMAIL', ssn: 'SSN',
  'record-number': 'RECORD-NO', 'health-plan-number': 'PLAN-NO', 'account-number': 'ACCOUNT-NO',
  'licence-number': 'LICENCE-NO', 'vehicle-id': 'VEHICLE', 'device-id': 'DEVICE', url: 'URL', 'ip-address': 'IP',
  'other-id': 'ID',
}

export type PlaceholderEntries = Record<string, { placeholder: string; category: IdentifierCategory }>

/** The key a term is stored under: NFC, whitespace runs collapsed, trimmed, lower-cased. */
export function normaliseTerm(term: string): string {
  return term.normalize('NFC').replace(/\s+/g, ' ').trim().toLowerCase()
}

const PLACEHOLDER = /^\[([A-Z]+(?:-[A-Z]+)*)-(\d+)\]$/

export class PlaceholderRegistry {
  private readonly entries = new Map<string, { placeholder: string; category: IdentifierCategory }>()
  private readonly lastNumber = new Map<string, number>()

  /** Rebuilds a registry from its stored form (see toJSON); numbering continues after the highest used. */
  constructor(stored: PlaceholderEntries = {}) {
    for (const [key, entry] of Object.entries(stored)) {
      const match = PLACEHOLDER.exec(entry.placeholder)
      if (!match || !(entry.category in PLACEHOLDER_LABELS)) throw new TypeError(`Bad placeholder entry for "${key}"`)
      this.entries.set(normaliseTerm(key), { placeholder: entry.placeholder, category: entry.category })
      this.lastNumber.set(match[1], Math.max(this.lastNumber.get(match[1]) ?? 0, Number(match[2])))
    }
  }

  /**
   * The placeholder for a term, the same every time the term recurs (ignoring case, spacing and
   * Unicode composition). A term seen before keeps its first placeholder even under another category.
   */
  placeholderFor(term: string, category: IdentifierCategory): string {
    const key = normaliseTerm(term)
    if (key === '') throw new RangeError('Cannot make a placeholder for an empty term')
    const known = this.entries.get(key)
    if (known) return known.placeholder
    const label = PLACEHOLDER_LABELS[category]
    const number = (this.lastNumber.get(label) ?? 0) + 1
    this.lastNumber.set(label, number)
    const placeholder = `[${label}-${number}]`
    this.entries.set(key, { placeholder, category })
    return placeholder
  }

  /** Plain object `{ [normalisedTerm]: { placeholder, category } }` for storing per study. */
  toJSON(): PlaceholderEntries {
    return Object.fromEntries([...this.entries].map(([key, entry]) => [key, { ...entry }]))
  }
}

export interface Redaction { start: number; end: number; category: IdentifierCategory; text: string }
export interface RedactionLogEntry {
  original: string
  placeholder: string
  category: IdentifierCategory
  /** Offsets in the original text (UTF-16 code units). */
  start: number
  end: number
}

function splitsSurrogatePair(text: string, at: number): boolean {
  return at > 0 && at < text.length && /[\uD800-\uDBFF]/.test(text[at - 1]) && /[\uDC00-\uDFFF]/.test(text[at])
}

/**
 * Replaces each span with its placeholder, working from the end backwards so earlier offsets stay
 * valid. Spans are JavaScript string indices into `text`; they must lie inside it, must not overlap,
 * must not split an emoji or other surrogate pair, and must still hold the text they were made from.
 */
export function applyRedactions(
  text: string,
  redactions: Redaction[],
  registry: PlaceholderRegistry,
): { text: string; log: RedactionLogEntry[] } {
  const sorted = [...redactions].sort((a, b) => a.start - b.start || a.end - b.end)
  sorted.forEach((r, i) => {
    if (!Number.isInteger(r.start) || !Number.isInteger(r.end) || r.start < 0 || r.end > text.length || r.start >= r.end) {
      throw new RangeError(`Redaction ${r.start}–${r.end} lies outside the text (length ${text.length})`)
    }
    if (splitsSurrogatePair(text, r.start) || splitsSurrogatePair(text, r.end)) {
      throw new RangeError(`Redaction ${r.start}–${r.end} splits a character`)
    }
    if (text.slice(r.start, r.end) !== r.text) {
      throw new RangeError(`Redaction ${r.start}–${r.end} no longer matches "${r.text}"`)
    }
    if (i > 0 && sorted[i - 1].end > r.start) {
      throw new RangeError(`Redactions ${sorted[i - 1].start}–${sorted[i - 1].end} and ${r.start}–${r.end} overlap`)
    }
  })
  // Placeholders are assigned in reading order, so [NAME-1] is the first name a reader meets.
  const log = sorted.map((r) => ({
    original: r.text, placeholder: registry.placeholderFor(r.text, r.category), category: r.category, start: r.start, end: r.end,
  }))
  let result = text
  for (let i = log.length - 1; i >= 0; i--) {
    result = result.slice(0, log[i].start) + log[i].placeholder + result.slice(log[i].end)
  }
  return { text: result, log }
}
