import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { MailAttachment } from './mail.service.js'

export type OutboxStatus = 'pending' | 'sent' | 'failed'

/**
 * An e-mail waiting to go out. Written in the same transaction as the action that causes it; the
 * mail worker (pg-boss job `mail-send`) sends it with retries and marks it sent, so a mail server
 * that is down delays mail and loses none.
 */
@Entity('mail_outbox')
@Index(['status', 'createdAt'])
export class OutboxMessage extends BaseEntity {
  @Column({ type: 'varchar', length: 254, name: 'to_address' })
  to: string

  @Column({ type: 'varchar', length: 300 })
  subject: string

  @Column({ type: 'text' })
  body: string

  /** a stable Message-ID, so a retried message is recognisably the same message */
  @Column({ type: 'varchar', length: 200, name: 'message_id' })
  messageId: string

  /** files to attach, read from the object store when the message is sent */
  @Column({ type: 'jsonb', default: [] })
  attachments: MailAttachment[]

  @Column({ type: 'varchar', length: 20, default: 'pending' })
  status: OutboxStatus

  @Column({ type: 'integer', default: 0 })
  attempts: number

  @Column({ type: 'text', name: 'last_error', nullable: true })
  lastError: string | null

  @Column({ type: 'timestamptz', name: 'sent_at', nullable: true })
  sentAt: Date | null
}
