import { z } from 'zod'

export const healthResponse = z.object({
  status: z.enum(['ok', 'degraded']),
  db: z.string(),
  storage: z.string(),
  mail: z.string(),
})
export type HealthResponse = z.infer<typeof healthResponse>
