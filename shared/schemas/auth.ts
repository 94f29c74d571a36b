import { z } from 'zod'
import { STUDY_ROLES } from '../permissions.js'
import { email, requiredText } from './common.js'

/** The password field: only bounded here; the policy (shared/passwords/policy.ts) runs in the service. */
export const passwordField = z.string().min(1, 'Enter a password.').max(4096, 'That password is too long.')

export const loginRequest = z.strictObject({ email, password: passwordField })
export type LoginRequest = z.infer<typeof loginRequest>

export const membershipSchema = z.object({
  studyId: z.string(),
  role: z.enum(STUDY_ROLES),
  studyTitle: z.string(),
  studyCode: z.string(),
})
export type Membership = z.infer<typeof membershipSchema>

export const userSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  siteAdmin: z.boolean(),
})
export type User = z.infer<typeof userSchema>

export const meResponse = z.object({ user: userSchema, memberships: z.array(membershipSchema) })
export type MeResponse = z.infer<typeof meResponse>

export const csrfResponse = z.object({ token: z.string() })

export const passwordResetRequest = z.strictObject({ email })
export const passwordResetConfirm = z.strictObject({
  token: z.string().min(10).max(200),
  password: passwordField,
})
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirm>

export const passwordChangeRequest = z.strictObject({
  currentPassword: passwordField,
  newPassword: passwordField,
  signOutOtherSessions: z.boolean().default(true),
})
export type PasswordChangeRequest = z.infer<typeof passwordChangeRequest>

export const tokenParams = z.strictObject({ token: z.string().min(10).max(200) })

export const invitationPreview = z.object({
  email: z.string(),
  role: z.enum(STUDY_ROLES),
  studyTitle: z.string(),
  invitedBy: z.string(),
  accountExists: z.boolean(),
  expiresAt: z.string(),
})
export type InvitationPreview = z.infer<typeof invitationPreview>

export const invitationAccept = z.strictObject({
  /** required when the invitee has no account yet */
  name: requiredText(120, 'Your name').optional(),
  password: passwordField,
})
export type InvitationAccept = z.infer<typeof invitationAccept>

/** Accepting an invitation signs the person in and names the study they joined. */
export const invitationAcceptResponse = meResponse.extend({ studyId: z.string() })
export type InvitationAcceptResponse = z.infer<typeof invitationAcceptResponse>
