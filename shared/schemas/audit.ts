import { z } from 'zod'

export const auditEventSchema = z.object({
  id: z.string(),
  at: z.string(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  targetType: z.string().nullable(),
  targetId: z.string().nullable(),
  ip: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
})
export type AuditEvent = z.infer<typeof auditEventSchema>

export const auditQuery = z.strictObject({
  page: z.coerce.number().int().min(1).max(100000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  action: z.string().trim().max(60).optional(),
  actor: z.string().trim().max(254).optional(),
})
export type AuditQuery = z.infer<typeof auditQuery>

export const auditPage = z.object({ events: z.array(auditEventSchema), total: z.number(), page: z.number(), pageSize: z.number() })
export type AuditPage = z.infer<typeof auditPage>
