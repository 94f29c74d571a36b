import { z } from 'zod'

/** The development mailbox: what the local fake SMTP server received (never in production). */
export const devMailSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  messageId: z.string().nullable(),
  attachments: z.array(z.object({ filename: z.string().nullable(), contentType: z.string(), size: z.number() })),
})
export type DevMail = z.infer<typeof devMailSchema>
export const devMailboxResponse = z.object({ messages: z.array(devMailSchema) })
