import { ref, type Ref } from 'vue'
import type { Theme } from '@shared/schemas/themes'

/**
 * Drag to order on the themes board (the lead, with a mouse; the move buttons stay for the keyboard).
 * Dropping near a card's top or bottom edge places the theme before or after it, at that card's level;
 * dropping on the middle of a theme makes it a sub-theme there. Two levels only: a theme with sub-themes
 * of its own stays at the top, and a theme cannot go inside itself. The dragged theme is kept here, not
 * in the drag data, so nothing outside the board can be dropped onto it.
 */
export interface ThemeBranch {
  theme: Theme
  children: Theme[]
}
export type DropPlace = 'before' | 'after' | 'inside'
export interface DropTarget {
  id: string
  place: DropPlace
}

const copyOf = (branches: ThemeBranch[]): ThemeBranch[] => branches.map((b) => ({ theme: b.theme, children: [...b.children] }))
const shapeOf = (branches: ThemeBranch[]): string => JSON.stringify(branches.map((b) => [b.theme.id, b.children.map((c) => c.id)]))

/** The branches after dropping one theme at a place by another, or null when that drop is not possible. */
export function droppedBranches(branches: ThemeBranch[], draggedId: string, target: DropTarget): ThemeBranch[] | null {
  if (draggedId === target.id) return null
  const next = copyOf(branches)
  let moving: ThemeBranch
  const fromTop = next.findIndex((b) => b.theme.id === draggedId)
  if (fromTop >= 0) {
    moving = next.splice(fromTop, 1)[0]
  } else {
    const parent = next.find((b) => b.children.some((c) => c.id === draggedId))
    if (!parent) return null
    const [theme] = parent.children.splice(
      parent.children.findIndex((c) => c.id === draggedId),
      1,
    )
    moving = { theme, children: [] }
  }
  // A sub-theme of the dragged theme is gone from the top level with it: dropping into itself finds nothing.
  const atTop = next.findIndex((b) => b.theme.id === target.id)
  if (atTop >= 0) {
    if (target.place !== 'inside') next.splice(target.place === 'before' ? atTop : atTop + 1, 0, moving)
    else if (moving.children.length) return null
    else next[atTop].children.push(moving.theme)
  } else {
    const parent = next.find((b) => b.children.some((c) => c.id === target.id))
    if (!parent || target.place === 'inside' || moving.children.length) return null
    const index = parent.children.findIndex((c) => c.id === target.id)
    parent.children.splice(target.place === 'before' ? index : index + 1, 0, moving.theme)
  }
  return shapeOf(next) === shapeOf(branches) ? null : next
}

/** Where on the card the pointer is: the outer quarters mean before or after, the middle inside (when nesting is possible). */
function placeOn(event: DragEvent, card: HTMLElement, canNest: boolean): DropPlace {
  const { top, height } = card.getBoundingClientRect()
  const share = height > 0 ? (event.clientY - top) / height : 0.5
  if (!canNest) return share < 0.5 ? 'before' : 'after'
  return share < 0.25 ? 'before' : share > 0.75 ? 'after' : 'inside'
}

export function useThemeDrag(tree: Ref<ThemeBranch[]>, enabled: () => boolean, commit: (branches: ThemeBranch[]) => void) {
  const draggedId = ref<string | null>(null)
  const target = ref<DropTarget | null>(null)

  function start(theme: Theme, event: DragEvent): void {
    if (!enabled()) {
      event.preventDefault()
      return
    }
    draggedId.value = theme.id
    if (event.dataTransfer) {
      event.dataTransfer.effectAllowed = 'move'
      // Some browsers start a drag only when it carries data.
      event.dataTransfer.setData('text/plain', theme.name)
      const card = (event.target as Element | null)?.closest<HTMLElement>('[data-theme-id]')
      if (card && typeof event.dataTransfer.setDragImage === 'function') event.dataTransfer.setDragImage(card, 24, 24)
    }
  }

  /** The drop the pointer points at over a card, or null when the dragged theme cannot land there. */
  function aimAt(theme: Theme, event: DragEvent): { place: DropTarget; branches: ThemeBranch[] } | null {
    const dragged = draggedId.value
    const card = event.currentTarget as HTMLElement | null
    if (!dragged || !card) return null
    const draggedBranch = tree.value.find((b) => b.theme.id === dragged)
    const targetIsTop = tree.value.some((b) => b.theme.id === theme.id)
    const canNest = targetIsTop && dragged !== theme.id && !draggedBranch?.children.length
    const place = { id: theme.id, place: placeOn(event, card, canNest) }
    const branches = droppedBranches(tree.value, dragged, place)
    return branches ? { place, branches } : null
  }

  function over(theme: Theme, event: DragEvent): void {
    const aim = aimAt(theme, event)
    if (!aim) {
      if (target.value?.id === theme.id) target.value = null
      return
    }
    // Accepting the dragover is what lets the drop happen here.
    event.preventDefault()
    if (event.dataTransfer) event.dataTransfer.dropEffect = 'move'
    if (target.value?.id !== aim.place.id || target.value.place !== aim.place.place) target.value = aim.place
  }

  function leave(theme: Theme, event: DragEvent): void {
    const card = event.currentTarget as HTMLElement | null
    const into = event.relatedTarget as Node | null
    // Moving between parts of the same card is not leaving it.
    if (card && into && card.contains(into)) return
    if (target.value?.id === theme.id) target.value = null
  }

  function drop(theme: Theme, event: DragEvent): void {
    const aim = aimAt(theme, event)
    end()
    if (!aim || !enabled()) return
    event.preventDefault()
    commit(aim.branches)
  }

  function end(): void {
    draggedId.value = null
    target.value = null
  }

  const isTarget = (id: string, place: DropPlace) => target.value?.id === id && target.value.place === place

  return { draggedId, target, isTarget, start, over, leave, drop, end }
}
