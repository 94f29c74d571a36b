import type { SnapshotCode } from '../schemas/coding.js'
import { buildCodeTree, flattenCodeTree } from './codebook-tree.js'

/**
 * What changed between two versions of a codebook (a snapshot and today's codebook, or two
 * snapshots). Codes are matched by id, so a renamed code is one code with a new label, not a removed
 * and an added one. A new position among the same siblings is not counted as a change.
 */

export const COMPARED_FIELDS = ['definition', 'whenToUse', 'whenNotToUse', 'colour', 'status'] as const
export type ComparedField = (typeof COMPARED_FIELDS)[number]

export interface CodebookDiffCode {
  id: string
  label: string
  /** the labels from the top down, e.g. "Living at home › Stairs" */
  path: string
}

export interface CodebookDiff {
  added: CodebookDiffCode[]
  removed: CodebookDiffCode[]
  renamed: { id: string; before: string; after: string }[]
  moved: { id: string; label: string; fromParent: string | null; toParent: string | null }[]
  changed: { id: string; label: string; fields: { field: ComparedField; before: string; after: string }[] }[]
  /** codes in both with no rename, move or field change */
  unchanged: number
}

/** Codes in reading order (parents before children) with their paths. */
function inTreeOrder(codes: readonly SnapshotCode[]) {
  return flattenCodeTree(buildCodeTree(codes))
}

export function compareCodebooks(before: readonly SnapshotCode[], after: readonly SnapshotCode[]): CodebookDiff {
  const beforeById = new Map(before.map((code) => [code.id, code]))
  const afterById = new Map(after.map((code) => [code.id, code]))
  const labelIn = (codes: Map<string, SnapshotCode>, id: string | null) => (id === null ? null : (codes.get(id)?.label ?? null))
  const diff: CodebookDiff = { added: [], removed: [], renamed: [], moved: [], changed: [], unchanged: 0 }

  for (const { code, path } of inTreeOrder(before)) {
    if (!afterById.has(code.id)) diff.removed.push({ id: code.id, label: code.label, path })
  }
  for (const { code, path } of inTreeOrder(after)) {
    const old = beforeById.get(code.id)
    if (!old) {
      diff.added.push({ id: code.id, label: code.label, path })
      continue
    }
    let same = true
    if (old.label !== code.label) {
      diff.renamed.push({ id: code.id, before: old.label, after: code.label })
      same = false
    }
    if (old.parentId !== code.parentId) {
      diff.moved.push({ id: code.id, label: code.label, fromParent: labelIn(beforeById, old.parentId), toParent: labelIn(afterById, code.parentId) })
      same = false
    }
    const fields = COMPARED_FIELDS.filter((field) => old[field] !== code[field]).map((field) => ({ field, before: old[field], after: code[field] }))
    if (fields.length > 0) {
      diff.changed.push({ id: code.id, label: code.label, fields })
      same = false
    }
    if (same) diff.unchanged += 1
  }
  return diff
}
