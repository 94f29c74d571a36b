/**
 * Moves character offsets from the original text into the redacted text. `edits` are the replaced
 * spans (original start/end) with the length of what replaced them, non-overlapping.
 */
export interface Edit {
  start: number
  end: number
  replacementLength: number
}

export function remapOffset(position: number, edits: readonly Edit[], side: 'start' | 'end'): number {
  let shift = 0
  for (const edit of [...edits].sort((a, b) => a.start - b.start)) {
    if (edit.end <= position) {
      shift += edit.replacementLength - (edit.end - edit.start)
      continue
    }
    if (edit.start < position) {
      // inside a replaced span: snap to the replacement's edge
      return side === 'start' ? edit.start + shift : edit.start + shift + edit.replacementLength
    }
    break
  }
  return position + shift
}
