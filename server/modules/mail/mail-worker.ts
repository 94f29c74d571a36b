import type PgBoss from 'pg-boss'
import type { Transporter } from 'nodemailer'
import { MAIL_QUEUE, type MailService } from './mail.service.js'

/** Drains the outbox: pg-boss delivers each job to one worker, retrying with backoff on failure. */
export async function startMailWorker(boss: PgBoss, mail: MailService, transport: Transporter): Promise<string> {
  return boss.work<{ outboxId: string }>(
    MAIL_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: 1, includeMetadata: true },
    async ([job]) => {
      await mail.deliver(transport, job.data.outboxId, job.retryCount)
    },
  )
}
