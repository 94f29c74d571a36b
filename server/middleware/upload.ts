import type { NextFunction, Request, Response } from 'express'
import multer from 'multer'
import { fileTypeFromBuffer } from 'file-type'
import type { ZodType } from 'zod'
import { AppError, ValidationError } from '../lib/errors.js'

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
  return detected.mime
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

/** A display name for an uploaded file: no path, no control characters, at most 200 characters. */
export function safeFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? 'file'
  return base.replace(/[\u0000-\u001f\u007f]/g, '').slice(0, 200) || 'file'
}
