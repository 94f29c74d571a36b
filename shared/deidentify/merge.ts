// Turns overlapping candidates into one flag per span.
import type { Candidate, Flag } from './categories.js'

/** Joins overlapping candidates of the same category into one span (keeping the higher rank). */
function unionByCategory(candidates: Candidate[], text: string): Candidate[] {
  const byCategory = new Map<string, Candidate[]>()
  for (const c of candidates) {
    if (c.end <= c.start) continue
    const list = byCategory.get(c.category) ?? []
    list.push(c)
    byCategory.set(c.category, list)
  }
  const joined: Candidate[] = []
  for (const list of byCategory.values()) {
    list.sort((a, b) => a.start - b.start || b.end - a.end)
    let current = { ...list[0] }
    for (const next of list.slice(1)) {
      if (next.start < current.end) {
        current.end = Math.max(current.end, next.end)
        current.rank = Math.max(current.rank, next.rank)
      } else {
        joined.push(current)
        current = { ...next }
      }
    }
    joined.push(current)
  }
  return joined.map((c) => ({ ...c, text: text.slice(c.start, c.end) }))
}

/**
 * Where flags of different categories overlap, the more specific detector wins (higher rank: a
 * labelled number beats a bare long number, an e-mail beats the name inside it), then the longer span.
 * The result is sorted by start and has no overlaps.
 */
export function resolveOverlaps(candidates: Candidate[], text: string): Flag[] {
  const ordered = unionByCategory(candidates, text).sort(
    (a, b) => b.rank - a.rank || b.end - b.start - (a.end - a.start) || a.start - b.start,
  )
  const kept: Candidate[] = [] // sorted by start, pairwise disjoint
  for (const c of ordered) {
    let lo = 0
    let hi = kept.length
    while (lo < hi) {
      const mid = (lo + hi) >> 1
      if (kept[mid].start < c.start) lo = mid + 1
      else hi = mid
    }
    const clashesBefore = lo > 0 && kept[lo - 1].end > c.start
    const clashesAfter = lo < kept.length && kept[lo].start < c.end
    if (!clashesBefore && !clashesAfter) kept.splice(lo, 0, c)
  }
  return kept.map(({ start, end, category, text: span }) => ({ start, end, category, text: span }))
}
