import { describe, expect, it } from 'vitest'
import { compareCodebooks } from '../../shared/coding/codebook-diff.js'
import type { SnapshotCode } from '../../shared/schemas/coding.js'

// Matching versions of a record by a stable key, so that a renamed record is one record with a new
// label rather than a removal and an addition, is common practice for comparing versions of a list.
const code = (id: string, label: string, parentId: string | null, extra: Partial<SnapshotCode> = {}): SnapshotCode => ({
  id,
  label,
  parentId,
  position: 0,
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  colour: '#0072B2',
  status: 'active',
  ...extra,
})

const before: SnapshotCode[] = [
  code('home', 'Living at home', null),
  code('stairs', 'Stairs', 'home', { definition: 'Getting up and down stairs.' }),
  code('info', 'Information', null),
  code('leaflets', 'Leaflets', 'info'),
  code('fatigue', 'Tiredness', null),
]

describe('compareCodebooks', () => {
  it('finds nothing changed between a codebook and itself', () => {
    const diff = compareCodebooks(before, before)
    expect(diff).toEqual({ added: [], removed: [], renamed: [], moved: [], changed: [], unchanged: 5 })
  })

  it('reports added and removed codes with their paths', () => {
    const after = [...before.filter((c) => c.id !== 'leaflets'), code('rails', 'Grab rails', 'home')]
    const diff = compareCodebooks(before, after)
    expect(diff.added).toEqual([{ id: 'rails', label: 'Grab rails', path: 'Living at home › Grab rails' }])
    expect(diff.removed).toEqual([{ id: 'leaflets', label: 'Leaflets', path: 'Information › Leaflets' }])
    expect(diff.unchanged).toBe(4)
  })

  it('reports a renamed code once, as a rename, not as removed and added', () => {
    const after = before.map((c) => (c.id === 'fatigue' ? { ...c, label: 'Fatigue' } : c))
    const diff = compareCodebooks(before, after)
    expect(diff.renamed).toEqual([{ id: 'fatigue', before: 'Tiredness', after: 'Fatigue' }])
    expect(diff.added).toEqual([])
    expect(diff.removed).toEqual([])
    expect(diff.unchanged).toBe(4)
  })

  it('reports moves with the old and the new parent labels, in the reading order of the new codebook', () => {
    const after = before.map((c) => (c.id === 'leaflets' ? { ...c, parentId: 'home' } : c.id === 'stairs' ? { ...c, parentId: null } : c))
    const diff = compareCodebooks(before, after)
    // after: Information, Living at home › Leaflets, Stairs, Tiredness (equal positions sort by label)
    expect(diff.moved).toEqual([
      { id: 'leaflets', label: 'Leaflets', fromParent: 'Information', toParent: 'Living at home' },
      { id: 'stairs', label: 'Stairs', fromParent: 'Living at home', toParent: null },
    ])
  })

  it('lists each changed field with its value before and after', () => {
    const after = before.map((c) => (c.id === 'stairs' ? { ...c, definition: 'Stairs at home or outside.', status: 'retired' as const, colour: '#D55E00' } : c))
    const diff = compareCodebooks(before, after)
    expect(diff.changed).toEqual([
      {
        id: 'stairs',
        label: 'Stairs',
        fields: [
          { field: 'definition', before: 'Getting up and down stairs.', after: 'Stairs at home or outside.' },
          { field: 'colour', before: '#0072B2', after: '#D55E00' },
          { field: 'status', before: 'active', after: 'retired' },
        ],
      },
    ])
    expect(diff.unchanged).toBe(4)
  })

  it('does not count a new place among the same siblings as a change', () => {
    const after = before.map((c) => (c.id === 'info' ? { ...c, position: 5 } : c))
    expect(compareCodebooks(before, after).unchanged).toBe(5)
  })

  it('counts a code that is renamed and moved in both lists but not as unchanged', () => {
    const after = before.map((c) => (c.id === 'leaflets' ? { ...c, label: 'Printed leaflets', parentId: null } : c))
    const diff = compareCodebooks(before, after)
    expect(diff.renamed).toHaveLength(1)
    expect(diff.moved).toEqual([{ id: 'leaflets', label: 'Printed leaflets', fromParent: 'Information', toParent: null }])
    expect(diff.unchanged).toBe(4)
  })
})
