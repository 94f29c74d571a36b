import { randomUUID } from 'node:crypto'
import type { DataSource, EntityManager } from 'typeorm'
import type PgBoss from 'pg-boss'
import type { Transporter } from 'nodemailer'
import type { Logger } from '../../lib/logger.js'
import type { ObjectStore } from '../../storage/object-store.js'
import { OutboxMessage } from './outbox-message.entity.js'

export const MAIL_QUEUE = 'mail-send'
export const MAIL_MAX_ATTEMPTS = 12

export type MailAttachment = { filename: string; contentType: string } & ({ storageKey: string; content?: undefined } | { content: string; storageKey?: undefined })

export interface MailDraft {
  to: string
  subject: string
  /** plain text; never participant data, only links into Heardwell (HIPAA 164.312(e)) */
  body: string
  /** files attached when sent: from the object store (e.g. a consent receipt) or small inline text (e.g. a calendar file) */
  attachments?: MailAttachment[]
}

/**
 * The e-mail outbox. `enqueue` runs inside the caller's transaction: the outbox row and its queue job
 * commit together with the action that caused them, or not at all.
 */
export class MailService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly boss: PgBoss,
    private readonly from: string,
    private readonly log: Logger,
    private readonly storage?: ObjectStore,
  ) {}

  async enqueue(manager: EntityManager, draft: MailDraft): Promise<OutboxMessage> {
    if (!manager.queryRunner?.isTransactionActive) throw new Error('MailService.enqueue must run inside a transaction')
    const domain = this.from.match(/@([^>\s]+)/)?.[1] ?? 'heardwell.invalid'
    const message = manager.create(OutboxMessage, {
      to: draft.to,
      subject: draft.subject.replace(/[\r\n]+/g, ' '),
      body: draft.body,
      messageId: `<${randomUUID()}@${domain}>`,
      attachments: draft.attachments ?? [],
      status: 'pending',
    })
    await manager.save(message)
    const runner = manager.queryRunner
    await this.boss.send(
      MAIL_QUEUE,
      { outboxId: message.id },
      {
        retryLimit: MAIL_MAX_ATTEMPTS - 1,
        retryDelay: 5,
        retryBackoff: true,
        db: { executeSql: async (text: string, values: unknown[]) => ({ rows: (await runner.query(text, values, true)).records }) },
      },
    )
    return message
  }

  /**
   * Sends one outbox message. pg-boss hands a job to one worker at a time, and a message already
   * marked sent is skipped, so two app instances never send the same message twice. The fixed
   * Message-ID lets a receiving server recognise the rare repeat after a crash between SMTP accepting
   * the message and the row being marked.
   */
  async deliver(transport: Transporter, outboxId: string, attempt: number): Promise<void> {
    const repo = this.dataSource.getRepository(OutboxMessage)
    const message = await repo.findOneBy({ id: outboxId })
    if (!message || message.status === 'sent') return
    try {
      const attachments = await Promise.all(
        message.attachments.map(async (a) => {
          if (a.content !== undefined) return { filename: a.filename, contentType: a.contentType, content: a.content }
          if (!this.storage) throw new Error('this mail worker has no object store for attachments')
          return { filename: a.filename, contentType: a.contentType, content: await this.storage.get(a.storageKey!) }
        }),
      )
      await transport.sendMail({
        from: this.from,
        to: message.to,
        subject: message.subject,
        text: message.body,
        messageId: message.messageId,
        attachments,
      })
      await repo.update({ id: message.id }, { status: 'sent', sentAt: new Date(), attempts: message.attempts + 1, lastError: null })
    } catch (error) {
      const permanent = attempt + 1 >= MAIL_MAX_ATTEMPTS || isPermanentSmtpError(error)
      await repo.update(
        { id: message.id },
        { attempts: message.attempts + 1, lastError: String((error as Error).message).slice(0, 500), status: permanent ? 'failed' : 'pending' },
      )
      this.log.warn({ outboxId, attempt, permanent, err: (error as Error).message }, 'e-mail not sent')
      if (!permanent) throw error
    }
  }
}

function isPermanentSmtpError(error: unknown): boolean {
  const code = (error as { responseCode?: number }).responseCode
  return typeof code === 'number' && code >= 500 && code < 600
}
