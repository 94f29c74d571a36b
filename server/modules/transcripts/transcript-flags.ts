import { randomUUID } from 'node:crypto'
import type { Flag, FlagDecisions } from '../../../shared/schemas/interviews.js'
import { IDENTIFIER_CATEGORIES, type IdentifierCategory } from '../../../shared/deidentify/index.js'
import { ValidationError } from '../../lib/errors.js'

export function asCategory(value: string): IdentifierCategory {
  if (!(IDENTIFIER_CATEGORIES as readonly string[]).includes(value)) {
    throw new ValidationError(`Unknown identifier category "${value}".`, [{ path: 'category', message: 'Choose a category from the list.' }])
  }
  return value as IdentifierCategory
}

function escapeRegExp(text: string): string {
  return text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
}

/**
 * Applies a reviewer's decisions: single flags accepted or rejected, a term accepted everywhere in the
 * text at once, and passages selected by hand. Returns the new flag list, sorted by position.
 */
export function applyDecisions(text: string, flags: Flag[], input: FlagDecisions): Flag[] {
  const next = flags.map((f) => ({ ...f }))
  const byId = new Map(next.map((f) => [f.id, f]))
  for (const d of input.decisions) {
    const flag = byId.get(d.id)
    if (!flag) throw new ValidationError('A decision names a flag that is not on this transcript.', [{ path: 'decisions', message: `Unknown flag ${d.id}.` }])
    flag.decision = d.decision
  }
  for (const { term, category } of input.acceptEverywhere) {
    const cat = asCategory(category)
    const pattern = new RegExp(`(?<![\\p{L}\\p{N}])${escapeRegExp(term.normalize('NFC'))}(?![\\p{L}\\p{N}])`, 'giu')
    for (const match of text.matchAll(pattern)) {
      const start = match.index!
      const end = start + match[0].length
      const existing = next.find((f) => f.start === start && f.end === end)
      if (existing) Object.assign(existing, { decision: 'accepted', category: cat })
      else next.push({ id: randomUUID(), start, end, category: cat, text: match[0], source: 'study-term', decision: 'accepted' })
    }
  }
  for (const m of input.manual) {
    if (m.end > text.length || m.start >= m.end) throw new ValidationError('The selected passage is outside the transcript.', [{ path: 'manual', message: 'Select text inside the transcript.' }])
    next.push({ id: randomUUID(), start: m.start, end: m.end, category: asCategory(m.category), text: text.slice(m.start, m.end), source: 'manual', decision: 'accepted' })
  }
  return next.sort((a, b) => a.start - b.start || b.end - a.end)
}

/** Accepted flags with overlaps merged (the wider span wins), ready to replace. */
export function acceptedSpans(text: string, flags: Flag[]): { start: number; end: number; category: IdentifierCategory; text: string }[] {
  const spans: { start: number; end: number; category: IdentifierCategory; text: string }[] = []
  for (const f of flags.filter((x) => x.decision === 'accepted').sort((a, b) => a.start - b.start || b.end - a.end)) {
    const last = spans.at(-1)
    if (last && f.start < last.end) {
      if (f.end > last.end) {
        last.end = f.end
        last.text = text.slice(last.start, last.end)
      }
      continue
    }
    spans.push({ start: f.start, end: f.end, category: f.category as IdentifierCategory, text: text.slice(f.start, f.end) })
  }
  return spans
}
