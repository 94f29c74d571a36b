import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { StudyRole } from '../../../shared/permissions.js'
import { User } from '../users/user.entity.js'
import { Study } from './study.entity.js'

/** An e-mailed invitation to join a study; only the SHA-256 of its token is stored. */
@Entity('invitations')
export class Invitation extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'varchar', length: 254 })
  email: string

  @Column({ type: 'varchar', length: 20 })
  role: StudyRole

  @Index({ unique: true })
  @Column({ type: 'char', length: 64, name: 'token_hash' })
  tokenHash: string

  @Column({ type: 'uuid', name: 'invited_by_id', nullable: true })
  invitedById: string | null

  @Column({ type: 'timestamptz', name: 'expires_at' })
  expiresAt: Date

  @Column({ type: 'timestamptz', name: 'accepted_at', nullable: true })
  acceptedAt: Date | null

  @Column({ type: 'timestamptz', name: 'revoked_at', nullable: true })
  revokedAt: Date | null

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>

  @ManyToOne(() => User, { onDelete: 'SET NULL' })
  @JoinColumn({ name: 'invited_by_id' })
  invitedBy: Relation<User> | null
}
