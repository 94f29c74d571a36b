import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'

@Entity('users')
export class User extends BaseEntity {
  @Index({ unique: true })
  @Column({ type: 'varchar', length: 254 })
  email: string

  @Column({ type: 'varchar', length: 120 })
  name: string

  /** argon2id hash; null until the person sets a password from their e-mailed link */
  @Column({ type: 'varchar', length: 255, name: 'password_hash', nullable: true })
  passwordHash: string | null

  @Column({ type: 'boolean', name: 'site_admin', default: false })
  siteAdmin: boolean

  @Column({ type: 'boolean', default: false })
  disabled: boolean

  @Column({ type: 'timestamptz', name: 'password_changed_at', nullable: true })
  passwordChangedAt: Date | null
}
