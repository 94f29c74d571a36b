import { z } from 'zod'

/** Text from people: NFC-normalised, no NUL (PostgreSQL cannot store it), bounded. */
export const text = (max: number) =>
  z
    .string()
    .max(max)
    .refine((value) => !value.includes('\u0000'), { message: 'Remove the invisible NUL character from this text.' })
    .transform((value) => value.normalize('NFC'))

export const requiredText = (max: number, label = 'This field') =>
  z
    .string()
    .trim()
    .min(1, `${label} is required.`)
    .max(max, `${label} must be at most ${max} characters.`)
    .refine((value) => !value.includes('\u0000'), { message: 'Remove the invisible NUL character from this text.' })
    .transform((value) => value.normalize('NFC'))

/**
 * E-mail addresses: a plain local part (no quoted local parts, no comments, no CR/LF), lower-cased.
 * Stricter than RFC 5322 on purpose: these go to the mail server (ASVS 1.3.11).
 */
export const email = z
  .string()
  .trim()
  .max(254, 'An e-mail address has at most 254 characters.')
  .regex(/^[A-Za-z0-9.!#$%&'*+/=?^_`{|}~-]+@[A-Za-z0-9-]+(\.[A-Za-z0-9-]+)+$/, 'Enter an e-mail address like name@example.org.')
  .transform((value) => value.toLowerCase())

export const uuid = z.uuid({ message: 'Not a valid id.' })

/** A calendar date as YYYY-MM-DD. */
export const isoDate = z.iso.date({ message: 'Use a date like 2026-05-31.' })

export const idParams = z.strictObject({ studyId: uuid })

/** RFC 9457 problem details, as every error response carries them. */
export const problemSchema = z.object({
  type: z.string(),
  title: z.string(),
  status: z.number(),
  detail: z.string().optional(),
  errors: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
})
export type Problem = z.infer<typeof problemSchema>

export const pageQuery = z.strictObject({
  page: z.coerce.number().int().min(1).max(100000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
})
