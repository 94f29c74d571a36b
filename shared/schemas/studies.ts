import { z } from 'zod'
import { STUDY_ROLES } from '../permissions.js'
import { email, isoDate, requiredText, text } from './common.js'

export const studyCode = z
  .string()
  .trim()
  .min(2, 'The short code needs at least 2 characters.')
  .max(20, 'The short code has at most 20 characters.')
  .regex(/^[A-Za-z0-9-]+$/, 'Use letters, digits and hyphens only in the short code.')
  .transform((value) => value.toUpperCase())

export const studySchema = z.object({
  id: z.string(),
  code: z.string(),
  title: z.string(),
  summary: z.string(),
  ethicsBoard: z.string(),
  ethicsReference: z.string(),
  approvalDate: z.string().nullable(),
  approvalExpiry: z.string().nullable(),
  targetSampleSize: z.number().nullable(),
  leadName: z.string().nullable(),
  memberCount: z.number(),
  createdAt: z.string(),
})
export type Study = z.infer<typeof studySchema>

export const studyListResponse = z.object({ studies: z.array(studySchema.extend({ myRole: z.enum(STUDY_ROLES).nullable() })) })
export type StudyListResponse = z.infer<typeof studyListResponse>

export const studyCreate = z.strictObject({
  code: studyCode,
  title: requiredText(200, 'The title'),
  summary: text(2000).default(''),
  /** the lead researcher: an existing account, or an invitation is sent */
  leadEmail: email,
})
export type StudyCreate = z.infer<typeof studyCreate>

export const studyUpdate = z
  .strictObject({
    title: requiredText(200, 'The title'),
    summary: text(2000),
    ethicsBoard: text(200),
    ethicsReference: text(100),
    approvalDate: isoDate.nullable(),
    approvalExpiry: isoDate.nullable(),
    targetSampleSize: z.number().int().min(1).max(10000).nullable(),
  })
  .partial()
  .refine((v) => !v.approvalDate || !v.approvalExpiry || v.approvalDate <= v.approvalExpiry, {
    message: 'The approval expiry must come after the approval date.',
    path: ['approvalExpiry'],
  })
export type StudyUpdate = z.infer<typeof studyUpdate>

export const assignLead = z.strictObject({ email })

export const memberSchema = z.object({
  id: z.string(),
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: z.enum(STUDY_ROLES),
  joinedAt: z.string(),
})
export type Member = z.infer<typeof memberSchema>
export const memberListResponse = z.object({ members: z.array(memberSchema) })

export const memberParams = z.strictObject({ studyId: z.uuid(), memberId: z.uuid() })
export const memberUpdate = z.strictObject({ role: z.enum(STUDY_ROLES) })

export const invitationSchema = z.object({
  id: z.string(),
  email: z.string(),
  role: z.enum(STUDY_ROLES),
  invitedBy: z.string(),
  createdAt: z.string(),
  expiresAt: z.string(),
  status: z.enum(['open', 'accepted', 'revoked', 'expired']),
})
export type Invitation = z.infer<typeof invitationSchema>
export const invitationListResponse = z.object({ invitations: z.array(invitationSchema) })
export const invitationCreate = z.strictObject({ email, role: z.enum(STUDY_ROLES) })
export type InvitationCreate = z.infer<typeof invitationCreate>
export const invitationParams = z.strictObject({ studyId: z.uuid(), invitationId: z.uuid() })
