import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import { User } from '../users/user.entity.js'

/** A single-use, expiring link to set a password; only the SHA-256 of the token is stored. */
@Entity('password_reset_tokens')
export class PasswordResetToken extends BaseEntity {
  @Column({ type: 'uuid', name: 'user_id' })
  userId: string

  @Index({ unique: true })
  @Column({ type: 'char', length: 64, name: 'token_hash' })
  tokenHash: string

  @Column({ type: 'timestamptz', name: 'expires_at' })
  expiresAt: Date

  @Column({ type: 'timestamptz', name: 'used_at', nullable: true })
  usedAt: Date | null

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>
}
