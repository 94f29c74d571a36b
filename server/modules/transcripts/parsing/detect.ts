import { isZip, zipEntryNames } from './zip-entries.js'
import { TranscriptParseError, type TranscriptFormat } from './types.js'

const EXPORT_HINT = 'export the transcript as .docx, .txt, .vtt or .srt.'
export const DAMAGED_WORD = 'The Word file could not be read; it may be damaged. Save it again and retry.'

/** Leading bytes of kinds of file people upload by mistake (each format's published signature; common practice). */
const SIGNATURES: { bytes: number[]; at?: number; reason: string; message: string }[] = [
  { bytes: [0x25, 0x50, 0x44, 0x46, 0x2d], reason: 'pdf', message: `This looks like a PDF; ${EXPORT_HINT}` },
  { bytes: [0x89, 0x50, 0x4e, 0x47], reason: 'image', message: `This looks like an image, not a transcript; ${EXPORT_HINT}` },
  { bytes: [0xff, 0xd8, 0xff], reason: 'image', message: `This looks like an image, not a transcript; ${EXPORT_HINT}` },
  { bytes: [0x47, 0x49, 0x46, 0x38], reason: 'image', message: `This looks like an image, not a transcript; ${EXPORT_HINT}` },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1], reason: 'old-word', message: 'This looks like an older Word file (.doc); open it in Word and save it as .docx, then retry.' },
  { bytes: [0x7b, 0x5c, 0x72, 0x74, 0x66], reason: 'rtf', message: `This looks like a Rich Text (.rtf) file; ${EXPORT_HINT}` },
  { bytes: [0x49, 0x44, 0x33, 0x03], reason: 'recording', message: 'This looks like an audio recording; upload the written transcript, not the recording.' },
  { bytes: [0x49, 0x44, 0x33, 0x04], reason: 'recording', message: 'This looks like an audio recording; upload the written transcript, not the recording.' },
  { bytes: [0x66, 0x74, 0x79, 0x70], at: 4, reason: 'recording', message: 'This looks like an audio or video recording; upload the written transcript, not the recording.' },
  { bytes: [0x4f, 0x67, 0x67, 0x53], reason: 'recording', message: 'This looks like an audio recording; upload the written transcript, not the recording.' },
  { bytes: [0x66, 0x4c, 0x61, 0x43], reason: 'recording', message: 'This looks like an audio recording; upload the written transcript, not the recording.' },
  { bytes: [0x52, 0x49, 0x46, 0x46], reason: 'recording', message: 'This looks like an audio, video or image file (RIFF), not a transcript.' },
  { bytes: [0x7f, 0x45, 0x4c, 0x46], reason: 'program', message: 'This looks like a program, not a transcript; it cannot be read.' },
]

function refuse(reason: string, message: string): never {
  throw new TranscriptParseError(reason, message)
}

function startsWith(buffer: Buffer, bytes: number[], at = 0): boolean {
  return buffer.length >= at + bytes.length && bytes.every((b, i) => buffer[at + i] === b)
}

/**
 * Decodes the bytes as strict UTF-8 (WHATWG Encoding; invalid sequences are refused, never replaced),
 * drops a BOM, turns \r\n and lone \r into \n and normalises to NFC (UAX #15). Refuses NUL and other
 * control characters, which text transcripts never contain (common practice).
 */
export function decodeText(buffer: Buffer): string {
  if (startsWith(buffer, [0xff, 0xfe]) || startsWith(buffer, [0xfe, 0xff])) {
    refuse('not-utf8', 'This text file is saved as UTF-16; save it again as UTF-8 text and retry.')
  }
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(buffer)
  } catch {
    refuse('not-utf8', `This file is not readable text (it is not UTF-8); ${EXPORT_HINT}`)
  }
  if (text.includes('\0')) refuse('binary', `This file contains binary data (NUL bytes), not text; ${EXPORT_HINT}`)
  if (/[\u0001-\u0008\u000e-\u001f\u007f]/.test(text)) refuse('binary', `This file contains control characters, not plain text; ${EXPORT_HINT}`)
  return text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n').normalize('NFC')
}

/** Decides the format from the bytes alone, never the file name; throws TranscriptParseError for anything else. */
export function detectFormat(buffer: Buffer): TranscriptFormat {
  if (buffer.length === 0) refuse('empty', 'The file is empty.')
  if (isZip(buffer)) {
    const names = zipEntryNames(buffer)
    if (names === null) {
      if (buffer.includes('[Content_Types].xml') || buffer.includes('word/')) refuse('docx-damaged', DAMAGED_WORD)
      refuse('zip-damaged', `This is not a transcript format we read: a damaged zip archive. Please ${EXPORT_HINT}`)
    }
    if (names.includes('word/document.xml') && names.includes('[Content_Types].xml')) return 'docx'
    refuse('not-docx', `This is not a transcript format we read: a zip archive that is not a Word (.docx) document. Please ${EXPORT_HINT}`)
  }
  const known = SIGNATURES.find((s) => startsWith(buffer, s.bytes, s.at))
  if (known) refuse(known.reason, known.message)
  const text = decodeText(buffer)
  if (!text.trim()) refuse('empty', 'The file is empty.')
  if (/^WEBVTT(?:[ \t\n]|$)/.test(text)) return 'vtt'
  if (/^\s*(?:\d+[ \t]*\n)?[\d:,. \t]+-->/.test(text)) return 'srt'
  return 'text'
}
