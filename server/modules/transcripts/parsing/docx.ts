import JSZip from 'jszip'
import mammoth from 'mammoth'
import { DAMAGED_WORD } from './detect.js'
import { parseSpeakerLines, type SourceLine } from './text.js'
import { TranscriptParseError, type Segment } from './types.js'

/** Zip-bomb limits, checked before anything is extracted (OWASP ASVS 5.0 5.2.3). */
export const MAX_ZIP_ENTRIES = 1_000
export const MAX_UNCOMPRESSED_BYTES = 200 * 1024 * 1024

const TOO_BIG = 'This Word file unpacks to far more data than any transcript needs, so it cannot be read safely.'

/** An element of mammoth's document tree, as far as this reader needs it. */
interface DocNode {
  type: string
  value?: string
  children?: DocNode[]
}

type ZipObject = JSZip.JSZipObject & { _data?: { uncompressedSize?: number } }

function damaged(): TranscriptParseError {
  return new TranscriptParseError('docx-damaged', DAMAGED_WORD)
}

function unsafePath(name: string): boolean {
  return name.startsWith('/') || name.startsWith('\\') || /^[A-Za-z]:/.test(name) || name.split(/[\\/]/).includes('..')
}

/** Counts the bytes an entry really inflates to, stopping once past `budget` (declared sizes can lie). */
function inflatedSize(file: JSZip.JSZipObject, budget: number): Promise<number> {
  return new Promise((resolve, reject) => {
    let total = 0
    const stream = file.nodeStream('nodebuffer')
    stream.on('data', (chunk: Buffer) => {
      total += chunk.length
      if (total > budget) {
        stream.pause()
        reject(new TranscriptParseError('docx-too-large', TOO_BIG))
      }
    })
    stream.on('end', () => resolve(total))
    stream.on('error', () => reject(damaged()))
  })
}

/**
 * Reads the zip directory with jszip (which decompresses nothing) and refuses too many entries, a declared
 * total over the limit, or names that climb out of the archive ("..", absolute paths: zip slip). Then it
 * inflates the parts the Word reader will parse, counting real bytes, before mammoth sees the file.
 */
export async function guardDocx(buffer: Buffer, limits = { entries: MAX_ZIP_ENTRIES, bytes: MAX_UNCOMPRESSED_BYTES }): Promise<void> {
  let zip: JSZip
  try {
    zip = await JSZip.loadAsync(buffer)
  } catch {
    throw damaged()
  }
  const files = Object.values(zip.files) as ZipObject[]
  if (files.length > limits.entries) {
    throw new TranscriptParseError('docx-too-many-entries', `This Word file holds more than ${limits.entries} parts, which no transcript needs; it cannot be read safely.`)
  }
  let declared = 0
  for (const file of files) {
    if (unsafePath(file.unsafeOriginalName ?? file.name) || unsafePath(file.name)) {
      throw new TranscriptParseError('docx-unsafe-path', 'This Word file contains a part with an unsafe path, so it cannot be read. Save it again from Word and retry.')
    }
    declared += file._data?.uncompressedSize ?? 0
  }
  if (declared > limits.bytes) throw new TranscriptParseError('docx-too-large', TOO_BIG)
  let budget = limits.bytes
  for (const file of files) {
    if (file.dir || file.name.startsWith('word/media/')) continue
    budget -= await inflatedSize(file, budget)
  }
}

/** Walks mammoth's document tree: one string per paragraph, with "\n" for line breaks and tabs kept. */
function paragraphsOf(element: DocNode, out: string[]): void {
  if (element.type === 'paragraph') {
    out.push(textOf(element))
    return
  }
  for (const child of element.children ?? []) paragraphsOf(child, out)
}

function textOf(element: DocNode): string {
  if (element.type === 'text') return element.value ?? ''
  if (element.type === 'tab') return '\t'
  if (element.type === 'break') return '\n'
  return (element.children ?? []).map(textOf).join('')
}

/** Extracts the paragraphs of a guarded .docx; images are never read. */
async function readParagraphs(buffer: Buffer): Promise<string[]> {
  const paragraphs: string[] = []
  try {
    await mammoth.convertToHtml(
      { buffer },
      {
        convertImage: mammoth.images.imgElement(async () => ({ src: '' })),
        externalFileAccess: false,
        transformDocument: (document: DocNode) => {
          paragraphsOf(document, paragraphs)
          return document
        },
      },
    )
  } catch {
    throw damaged()
  }
  return paragraphs
}

/**
 * A Word transcript: each non-empty paragraph is numbered (empty paragraphs are not counted) and split at
 * line breaks; then the plain-text "Speaker: text" rules apply. A new paragraph without a label continues the
 * turn as a new paragraph ("\n"); a line break within a paragraph continues it with a space.
 */
export async function parseDocx(buffer: Buffer): Promise<Segment[]> {
  await guardDocx(buffer)
  const lines: SourceLine[] = []
  let number = 0
  for (const paragraph of await readParagraphs(buffer)) {
    if (!paragraph.trim()) continue
    number++
    paragraph.split('\n').forEach((text, i) => lines.push({ text: text.normalize('NFC'), where: number, newParagraph: i === 0 }))
  }
  return parseSpeakerLines(lines, 'Paragraph')
}
