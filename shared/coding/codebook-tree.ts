/**
 * The codebook is stored flat (each code names its parent and its position among its siblings);
 * these helpers turn it into a tree and answer the questions a move must ask first.
 */

/** The fields of a code the tree needs; codes from the API, snapshots and CSV rows all have them. */
export interface TreeCode {
  id: string
  parentId: string | null
  position: number
  label: string
}

export interface CodeTreeNode<C extends TreeCode = TreeCode> {
  code: C
  children: CodeTreeNode<C>[]
  /** 0 for a top-level code */
  depth: number
  /** the labels from the top down, e.g. "Living at home › Stairs" */
  path: string
}

export const PATH_SEPARATOR = ' › '

function bySiblingOrder(a: TreeCode, b: TreeCode): number {
  return a.position - b.position || a.label.localeCompare(b.label) || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0)
}

/**
 * Builds the tree, siblings ordered by position. A code whose parent is missing from the list
 * becomes a top-level code, and so does the first code met on a parent loop (which the server
 * never stores, but a damaged list must still show every code exactly once).
 */
export function buildCodeTree<C extends TreeCode>(codes: readonly C[]): CodeTreeNode<C>[] {
  const ids = new Set(codes.map((code) => code.id))
  const childrenOf = new Map<string | null, C[]>()
  for (const code of codes) {
    const parent = code.parentId !== null && ids.has(code.parentId) && code.parentId !== code.id ? code.parentId : null
    const siblings = childrenOf.get(parent) ?? []
    siblings.push(code)
    childrenOf.set(parent, siblings)
  }
  for (const siblings of childrenOf.values()) siblings.sort(bySiblingOrder)

  const placed = new Set<string>()
  const grow = (code: C, depth: number, parentPath: string | null): CodeTreeNode<C> => {
    placed.add(code.id)
    const path = parentPath === null ? code.label : `${parentPath}${PATH_SEPARATOR}${code.label}`
    const children = (childrenOf.get(code.id) ?? []).filter((child) => !placed.has(child.id)).map((child) => grow(child, depth + 1, path))
    return { code, children, depth, path }
  }

  const roots = (childrenOf.get(null) ?? []).map((code) => grow(code, 0, null))
  for (const code of [...codes].sort(bySiblingOrder)) {
    if (!placed.has(code.id)) roots.push(grow(code, 0, null))
  }
  return roots
}

/** The tree in reading order: each code, then its children, depth first. */
export function flattenCodeTree<C extends TreeCode>(tree: readonly CodeTreeNode<C>[]): CodeTreeNode<C>[] {
  const out: CodeTreeNode<C>[] = []
  const walk = (nodes: readonly CodeTreeNode<C>[]) => {
    for (const node of nodes) {
      out.push(node)
      walk(node.children)
    }
  }
  walk(tree)
  return out
}

/** The ids of every code below `id` (children, grandchildren …), not `id` itself. */
export function descendantsOf(codes: readonly Pick<TreeCode, 'id' | 'parentId'>[], id: string): string[] {
  const childrenOf = new Map<string, string[]>()
  for (const code of codes) {
    if (code.parentId === null) continue
    const siblings = childrenOf.get(code.parentId) ?? []
    siblings.push(code.id)
    childrenOf.set(code.parentId, siblings)
  }
  const found: string[] = []
  const seen = new Set<string>([id])
  const queue = [id]
  while (queue.length > 0) {
    for (const child of childrenOf.get(queue.shift()!) ?? []) {
      if (seen.has(child)) continue
      seen.add(child)
      found.push(child)
      queue.push(child)
    }
  }
  return found
}

/** True when nesting `codeId` under `newParentId` would put a code inside itself. */
export function wouldCreateCycle(codes: readonly Pick<TreeCode, 'id' | 'parentId'>[], codeId: string, newParentId: string | null): boolean {
  if (newParentId === null) return false
  if (newParentId === codeId) return true
  return descendantsOf(codes, codeId).includes(newParentId)
}
