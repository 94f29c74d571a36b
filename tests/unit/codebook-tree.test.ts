import { describe, expect, it } from 'vitest'
import { buildCodeTree, descendantsOf, flattenCodeTree, wouldCreateCycle, type TreeCode } from '../../shared/coding/codebook-tree.js'

// A hierarchical codebook is a rooted forest: parents before children, siblings in their stored
// order, and no code may sit inside itself (common practice for nested codebooks; the tree
// terms follow Knuth, The Art of Computer Programming vol. 1, "Trees", section from memory).
const code = (id: string, label: string, parentId: string | null, position: number): TreeCode => ({ id, label, parentId, position })

// Codes from the invented demo study "Coming Home After Stroke", stored out of order on purpose.
const codes: TreeCode[] = [
  code('stairs', 'Stairs', 'home', 1),
  code('info', 'Information at discharge', null, 0),
  code('home', 'Living at home', null, 1),
  code('bathroom', 'Bathroom', 'home', 0),
  code('rails', 'Grab rails', 'bathroom', 0),
  code('leaflets', 'Leaflets', 'info', 0),
]

describe('buildCodeTree', () => {
  it('nests codes under their parents and orders siblings by position', () => {
    const tree = buildCodeTree(codes)
    expect(tree.map((node) => node.code.label)).toEqual(['Information at discharge', 'Living at home'])
    expect(tree[1].children.map((node) => node.code.label)).toEqual(['Bathroom', 'Stairs'])
    expect(tree[1].children[0].children.map((node) => node.code.label)).toEqual(['Grab rails'])
  })

  it('gives each code its depth and its path of labels from the top', () => {
    const flat = flattenCodeTree(buildCodeTree(codes))
    expect(flat.map((node) => [node.path, node.depth])).toEqual([
      ['Information at discharge', 0],
      ['Information at discharge › Leaflets', 1],
      ['Living at home', 0],
      ['Living at home › Bathroom', 1],
      ['Living at home › Bathroom › Grab rails', 2],
      ['Living at home › Stairs', 1],
    ])
  })

  it('shows a code whose parent is missing at the top level', () => {
    const tree = buildCodeTree([code('a', 'Fatigue', 'gone', 0), code('b', 'Driving', null, 0)])
    expect(tree.map((node) => node.code.label).sort()).toEqual(['Driving', 'Fatigue'])
    expect(tree.every((node) => node.depth === 0)).toBe(true)
  })

  it('still shows every code exactly once when a damaged list has a parent loop', () => {
    const looped = [code('a', 'A', 'b', 0), code('b', 'B', 'a', 0), code('c', 'C', null, 0)]
    const flat = flattenCodeTree(buildCodeTree(looped))
    expect(flat.map((node) => node.code.id).sort()).toEqual(['a', 'b', 'c'])
  })

  it('returns an empty tree for an empty codebook', () => {
    expect(buildCodeTree([])).toEqual([])
  })
})

describe('descendantsOf', () => {
  it('lists children and grandchildren but not the code itself', () => {
    expect(descendantsOf(codes, 'home').sort()).toEqual(['bathroom', 'rails', 'stairs'])
    expect(descendantsOf(codes, 'rails')).toEqual([])
  })
})

describe('wouldCreateCycle', () => {
  it('refuses a code as its own parent and a code under its own descendant', () => {
    expect(wouldCreateCycle(codes, 'home', 'home')).toBe(true)
    expect(wouldCreateCycle(codes, 'home', 'rails')).toBe(true)
    expect(wouldCreateCycle(codes, 'bathroom', 'rails')).toBe(true)
  })

  it('allows a move to the top, to a sibling or to another branch', () => {
    expect(wouldCreateCycle(codes, 'rails', null)).toBe(false)
    expect(wouldCreateCycle(codes, 'stairs', 'bathroom')).toBe(false)
    expect(wouldCreateCycle(codes, 'home', 'leaflets')).toBe(false)
  })
})
