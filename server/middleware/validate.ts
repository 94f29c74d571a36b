import type { NextFunction, Request, Response } from 'express'
import type { ZodType } from 'zod'
import { ValidationError, type FieldError } from '../lib/errors.js'

export interface Schemas {
  body?: ZodType
  query?: ZodType
  params?: ZodType
}

/** Parses body, query and params with their shared zod schemas and hands typed input to the handler. */
export function validate(schemas: Schemas) {
  return function validateRequest(req: Request, _res: Response, next: NextFunction) {
    const errors: FieldError[] = []
    const valid: Request['valid'] = { body: undefined, query: undefined, params: undefined }
    for (const part of ['body', 'query', 'params'] as const) {
      const schema = schemas[part]
      if (!schema) continue
      const input = part === 'body' ? (req.body ?? {}) : req[part]
      const result = schema.safeParse(input)
      if (result.success) valid[part] = result.data
      else {
        for (const issue of result.error.issues) {
          const path = issue.path.join('.')
          const message =
            issue.code === 'unrecognized_keys' ? `Unexpected field(s): ${issue.keys.join(', ')}.` : issue.message
          errors.push({ path: part === 'body' ? path : `${part}.${path}`, message })
        }
      }
    }
    if (errors.length) return next(new ValidationError('Some fields need attention.', errors))
    req.valid = valid
    next()
  }
}
