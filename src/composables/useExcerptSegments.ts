import { computed, shallowRef, watch, type Ref } from 'vue'
import type { Code, Excerpt } from '@shared/schemas/coding'
import { assignLanes, segmentBlocks, type TextBlock } from '@shared/coding/segments'

/** A focusable mark where an excerpt begins: the keyboard's way to its codes. */
export interface ExcerptHandle {
  id: string
  /** the accessible name and tooltip: "Excerpt coded Fatigue, Returning to work" */
  name: string
  /** the code labels, shown beside the mark while it has focus */
  labels: string
  other: boolean
}

/** One run of text with the same excerpts over it: plain element attributes, no component. */
export interface TextSegment {
  start: number
  text: string
  /** the covering excerpts' ids, space-separated ('' when none) */
  ids: string
  style: string | undefined
  title: string | undefined
  handles: ExcerptHandle[]
}

export interface RenderedBlock {
  block: TextBlock
  segments: TextSegment[]
}

const OWN_LANES = 3
const OTHER_LANES = 2
const UNKNOWN = { label: 'a code not in the codebook', colour: '#6B6B6B' }

/** A stripe with each code's colour in turn, so an excerpt with two codes shows both. */
function paint(colours: string[], dashed: boolean): string {
  if (dashed) return `repeating-linear-gradient(90deg, ${colours.map((c, i) => `${c} ${i * 14}px ${i * 14 + 8}px, transparent ${i * 14 + 8}px ${(i + 1) * 14}px`).join(', ')})`
  if (colours.length === 1) return `linear-gradient(${colours[0]}, ${colours[0]})`
  return `repeating-linear-gradient(90deg, ${colours.map((c, i) => `${c} ${i * 12}px ${(i + 1) * 12}px`).join(', ')})`
}

/**
 * Cuts the transcript's blocks at every excerpt boundary (one sweep, shared/coding/segments.ts) and
 * works out each segment's underlines, tooltip and keyboard marks. Own excerpts are solid lines
 * under the text, one lane each; another coder's are dashed lines above it. A block whose segments
 * did not change keeps its old array, so only the turns an edit touched render again.
 */
export function useExcerptSegments(
  text: Ref<string>,
  blocks: Ref<TextBlock[]>,
  own: Ref<Excerpt[]>,
  other: Ref<Excerpt[]>,
  codes: Ref<Code[]>,
  otherName: Ref<string | null>,
) {
  const codeById = computed(() => new Map(codes.value.map((c) => [c.id, c])))
  const codesOf = (excerpt: Excerpt) => excerpt.codeIds.map((id) => codeById.value.get(id) ?? UNKNOWN)
  const labelsOf = (excerpt: Excerpt) => codesOf(excerpt).map((c) => c.label).join(', ')

  function render(): RenderedBlock[] {
    const byId = new Map<string, { excerpt: Excerpt; other: boolean }>()
    for (const e of own.value) byId.set(e.id, { excerpt: e, other: false })
    for (const e of other.value) byId.set(e.id, { excerpt: e, other: true })
    const ownLanes = assignLanes(own.value)
    const otherLanes = assignLanes(other.value)
    const marks = [...own.value, ...other.value].map((e) => ({ id: e.id, start: e.start, end: e.end }))
    const whose = otherName.value ?? 'Another coder'
    const cut = segmentBlocks(blocks.value, marks)
    return blocks.value.map((block, b) => ({
      block,
      segments: cut[b]!.map((segment) => {
        const images: string[] = []
        const places: string[] = []
        const sizes: string[] = []
        const titles: string[] = []
        const handles: ExcerptHandle[] = []
        for (const id of segment.marks) {
          const { excerpt, other: theirs } = byId.get(id)!
          const colours = [...new Set(codesOf(excerpt).map((c) => c.colour))]
          const labels = labelsOf(excerpt)
          if (theirs) {
            const lane = Math.min(otherLanes.get(id) ?? 0, OTHER_LANES - 1)
            images.push(paint(colours, true))
            places.push(`0 ${5 - lane * 4}px`)
            sizes.push('100% 2px')
            titles.push(`${whose}: ${labels}`)
          } else {
            const lane = Math.min(ownLanes.get(id) ?? 0, OWN_LANES - 1)
            images.push(paint(colours, false))
            places.push(`0 calc(100% - ${8 - lane * 4}px)`)
            sizes.push('100% 3px')
            titles.push(`Coded ${labels}`)
          }
          if (excerpt.start >= segment.start && excerpt.start < segment.end) {
            const name = theirs ? `${whose}’s excerpt coded ${labels} (read only)` : `Excerpt coded ${labels}`
            handles.push({ id, name, labels, other: theirs })
          }
        }
        return {
          start: segment.start,
          text: text.value.slice(segment.start, segment.end),
          ids: segment.marks.join(' '),
          style: images.length
            ? `background-image: ${images.join(', ')}; background-position: ${places.join(', ')}; background-size: ${sizes.join(', ')}; background-repeat: no-repeat`
            : undefined,
          title: titles.length ? titles.join('\n') : undefined,
          handles,
        }
      }),
    }))
  }

  const signature = (segments: TextSegment[]) =>
    segments.map((s) => `${s.start}|${s.text.length}|${s.ids}|${s.style}|${s.title}|${s.handles.map((h) => h.name).join('/')}`).join('\n')

  const rendered = shallowRef<RenderedBlock[]>([])
  let previous = new Map<string, { sig: string; row: RenderedBlock }>()
  watch(
    [text, blocks, own, other, codes, otherName],
    () => {
      const next = new Map<string, { sig: string; row: RenderedBlock }>()
      rendered.value = render().map((row) => {
        const sig = `${row.block.start}-${row.block.end}:${signature(row.segments)}`
        const kept = previous.get(row.block.key)
        const chosen = kept && kept.sig === sig ? kept.row : row
        next.set(row.block.key, { sig, row: chosen })
        return chosen
      })
      previous = next
    },
    { immediate: true },
  )
  return { rendered, labelsOf }
}
