import { Router } from 'express'
import type { Authorize } from '../../middleware/authorize.js'
import type { z } from 'zod'
import type { devMailboxResponse } from '../../../shared/schemas/dev.js'
import { readMailbox } from '../../fakes/mailbox-store.js'

/**
 * The development mailbox: every message the local fake SMTP server received. Mounted only when the
 * fake server runs (never in production), so invitations and reset links can be followed locally.
 */
export function mailboxRouter({ authorize, directory }: { authorize: Authorize; directory: string }) {
  const router = Router()
  router.get('/dev/mailbox', authorize('public'), (_req, res) => {
    const body: z.infer<typeof devMailboxResponse> = { messages: readMailbox(directory).slice(0, 200) }
    res.json(body)
  })
  return router
}
