import { z } from 'zod'
import { email, requiredText } from './common.js'

export const siteUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  siteAdmin: z.boolean(),
  disabled: z.boolean(),
  createdAt: z.string(),
})
export type SiteUser = z.infer<typeof siteUserSchema>
export const siteUserList = z.object({ users: z.array(siteUserSchema) })

/** The administrator creates an account; the person sets their own password from an e-mailed link. */
export const userCreate = z.strictObject({ email, name: requiredText(120, 'The name'), siteAdmin: z.boolean().default(false) })
export type UserCreate = z.infer<typeof userCreate>
export const userParams = z.strictObject({ userId: z.uuid() })
export const userUpdate = z.strictObject({ disabled: z.boolean() })
