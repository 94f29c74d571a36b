/**
 * What a parsed transcript looks like. `text` holds only the spoken words (no speaker labels, no times),
 * turn after turn separated by a blank line ("\n\n"), in Unicode NFC (UAX #15) with "\n" line endings and no BOM.
 * Each turn points into `text` by character offsets (JS string indices, so an emoji counts as 2), computed
 * after NFC so `text.slice(turn.start, turn.end)` is exactly the turn's words.
 */
export type TranscriptFormat = 'text' | 'docx' | 'vtt' | 'srt'

export interface Turn {
  speaker: string
  /** When the turn starts in the recording, in milliseconds; null when the file gives no time. */
  startMs: number | null
  start: number
  end: number
}

export interface ParsedTranscript {
  format: TranscriptFormat
  text: string
  turns: Turn[]
  wordCount: number
}

/** A turn before it is placed in the canonical text. */
export interface Segment {
  speaker: string
  startMs: number | null
  text: string
}

/**
 * A transcript we cannot read, in words a study coordinator understands. `reason` is a stable code for
 * the interface and logs; `line` is the 1-based line (or paragraph, for Word files) the message names.
 */
export class TranscriptParseError extends Error {
  readonly reason: string
  readonly line: number | null

  constructor(reason: string, message: string, line: number | null = null) {
    super(message)
    this.name = 'TranscriptParseError'
    this.reason = reason
    this.line = line
  }
}
