import { assemble } from './canonical.js'
import { parseCues } from './cues.js'
import { decodeText, detectFormat } from './detect.js'
import { parseDocx } from './docx.js'
import { parsePlainText } from './text.js'
import type { ParsedTranscript } from './types.js'

/**
 * Reads an uploaded transcript into speaker turns. The format is decided from the bytes (never the file
 * name); every failure is a TranscriptParseError whose message a study coordinator can act on.
 */
export async function parseTranscript(buffer: Buffer): Promise<ParsedTranscript> {
  const format = detectFormat(buffer)
  if (format === 'docx') return assemble(format, await parseDocx(buffer))
  const text = decodeText(buffer)
  return assemble(format, format === 'text' ? parsePlainText(text) : parseCues(text, format))
}

export { detectFormat, decodeText } from './detect.js'
export { countWords } from './canonical.js'
export { MAX_UNCOMPRESSED_BYTES, MAX_ZIP_ENTRIES } from './docx.js'
export { TranscriptParseError } from './types.js'
export type { ParsedTranscript, TranscriptFormat, Turn } from './types.js'
