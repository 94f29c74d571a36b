import type { NextFunction, Request, Response } from 'express'
import multer from 'multer'
import { fileTypeFromBuffer } from 'file-type'
import type { ZodType } from 'zod'
import { AppError, ValidationError } from '../lib/errors.js'
import { guardDocx, MAX_UNCOMPRESSED_BYTES, MAX_ZIP_ENTRIES } from '../modules/transcripts/parsing/docx.js'
import { TranscriptParseError } from '../modules/transcripts/parsing/types.js'

export const MAX_UPLOAD_BYTES = 20 * 1024 * 1024

/**
 * One file (field `file`) and a JSON `metadata` field, held in memory (never written to disk or the
 * web root), with multer's limits set so a malformed or oversized request is refused early.
 */
export function singleFileUpload() {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 5, parts: 8, fieldSize: 256 * 1024, fieldNameSize: 50 },
    defParamCharset: 'utf8',
  }).single('file')
  return function uploadSingle(req: Request, res: Response, next: NextFunction) {
    upload(req, res, (error?: unknown) => {
      if (!error) return next()
      const e = error as { code?: string }
      if (e.code === 'LIMIT_FILE_SIZE') return next(error)
      next(new AppError(400, 'bad-upload', 'The upload could not be read', 'Send one file in the field "file" with its details in "metadata".'))
    })
  }
}

const LABELS: Record<string, string> = {
  'application/pdf': 'PDF',
  'application/vnd.openxmlformats-officedocument.wordprocessingml.document': 'Word (.docx)',
  'image/png': 'PNG image',
  'image/jpeg': 'JPEG image',
}

/** Decides the file's type by its content (magic bytes), never by its name; refuses anything else. */
export async function requireFileType(file: Express.Multer.File | undefined, allowed: string[]): Promise<string> {
  if (!file || file.size === 0) throw new ValidationError('Choose a file to upload.', [{ path: 'file', message: 'Choose a file to upload.' }])
  const detected = await fileTypeFromBuffer(file.buffer)
  if (!detected || !allowed.includes(detected.mime)) {
    const wanted = allowed.map((m) => LABELS[m] ?? m).join(' or ')
    throw new AppError(415, 'unsupported-file', 'This kind of file is not accepted', `The file's content is not ${wanted}${detected ? ` (it looks like ${detected.ext})` : ''}. Save it as ${wanted} and try again.`)
  }
  const extension = /\.([A-Za-z0-9]{1,8})$/.exec(file.originalname.trim())?.[1]?.toLowerCase()
  if (extension && CLAIMS_A_TYPE.has(extension) && !(EXTENSIONS[detected.mime] ?? [detected.ext]).includes(extension)) {
    // the name must not claim another type than the content (ASVS 5.0 5.2.2): it is kept and sent back on download
    const label = LABELS[detected.mime] ?? detected.ext
    throw new AppError(415, 'unsupported-file', 'The file name does not match its content', `The file is ${label}, but its name ends in .${extension}. Rename it to end in .${(EXTENSIONS[detected.mime] ?? [detected.ext])[0]} and try again.`)
  }
  if (detected.mime === DOCX) await requireSafeDocx(file.buffer)
  return detected.mime
}

/** extensions that name a kind of file (so "Consent v1.2" is a name, not a claim); common practice */
const CLAIMS_A_TYPE = new Set(
  'pdf docx doc docm dotx odt rtf txt md csv xls xlsx pptx png jpg jpeg gif bmp tif tiff webp heic svg html htm xhtml xml js mjs exe dll msi bat cmd sh ps1 vbs jar apk php zip rar 7z gz'.split(' '),
)

const EXTENSIONS: Record<string, string[]> = {
  'application/pdf': ['pdf'],
  'application/vnd.openxmlformats-officedocument.wordprocessingml.document': ['docx'],
  'image/png': ['png'],
  'image/jpeg': ['jpg', 'jpeg'],
}

const DOCX = 'application/vnd.openxmlformats-officedocument.wordprocessingml.document'
const UNSAFE_DOCX: Record<string, string> = {
  'docx-too-large': `This Word file unpacks to more than ${MAX_UNCOMPRESSED_BYTES / 1024 / 1024} MB, far more than any document needs, so it is not accepted. Save it again from Word and retry.`,
  'docx-too-many-entries': `This Word file holds more than ${MAX_ZIP_ENTRIES} parts, far more than any document needs, so it is not accepted. Save it again from Word and retry.`,
}

/**
 * A stored Word file (consent form, interview guide) is checked like a transcript: the zip directory's entry
 * count, declared and real unpacked size, and part names, before it is kept or served (ASVS 5.0 5.2.3, 5.2.5).
 */
async function requireSafeDocx(buffer: Buffer): Promise<void> {
  try {
    await guardDocx(buffer)
  } catch (error) {
    if (!(error instanceof TranscriptParseError)) throw error
    throw new AppError(415, 'unsupported-file', 'This file cannot be accepted safely', UNSAFE_DOCX[error.reason] ?? error.message)
  }
}

/** The `metadata` field: JSON, checked with its shared schema. */
export function parseMetadata<T>(schema: ZodType<T>, raw: unknown): T {
  let value: unknown
  try {
    value = JSON.parse(typeof raw === 'string' ? raw : '')
  } catch {
    throw new ValidationError('The details sent with the file are not valid JSON.', [{ path: 'metadata', message: 'Not valid JSON.' }])
  }
  const result = schema.safeParse(value)
  if (!result.success) {
    const errors = result.error.issues.map((i) => ({ path: i.path.join('.'), message: i.code === 'unrecognized_keys' ? `Unexpected field(s): ${i.keys.join(', ')}.` : i.message }))
    throw new ValidationError('Some fields need attention.', errors)
  }
  return result.data
}

/** A display name for an uploaded file: no path, no control characters, at most 200 characters (a long name keeps its extension). */
export function safeFileName(name: string): string {
  const base = (name.split(/[\\/]/).pop() ?? 'file').replace(/[\u0000-\u001f\u007f]/g, '')
  if ([...base].length <= 200) return base || 'file'
  const extension = /\.[A-Za-z0-9]{1,8}$/.exec(base)?.[0] ?? ''
  return [...base.slice(0, base.length - extension.length)].slice(0, 200 - extension.length).join('') + extension
}
