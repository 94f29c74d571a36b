import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'

/** A single-use e-consent link sent by e-mail; only the SHA-256 of its token is stored. */
@Entity('consent_links')
@Index(['participantId', 'createdAt'])
export class ConsentLink extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'uuid', name: 'form_id' })
  formId: string

  @Index({ unique: true })
  @Column({ type: 'char', length: 64, name: 'token_hash' })
  tokenHash: string

  @Column({ type: 'timestamptz', name: 'expires_at' })
  expiresAt: Date

  @Column({ type: 'timestamptz', name: 'used_at', nullable: true })
  usedAt: Date | null

  @Column({ type: 'timestamptz', name: 'revoked_at', nullable: true })
  revokedAt: Date | null

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null
}
