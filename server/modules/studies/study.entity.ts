import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'

@Entity('studies')
export class Study extends BaseEntity {
  @Index({ unique: true })
  @Column({ type: 'varchar', length: 20 })
  code: string

  @Column({ type: 'varchar', length: 200 })
  title: string

  @Column({ type: 'text', default: '' })
  summary: string

  @Column({ type: 'varchar', length: 200, name: 'ethics_board', default: '' })
  ethicsBoard: string

  @Column({ type: 'varchar', length: 100, name: 'ethics_reference', default: '' })
  ethicsReference: string

  @Column({ type: 'date', name: 'approval_date', nullable: true })
  approvalDate: string | null

  @Column({ type: 'date', name: 'approval_expiry', nullable: true })
  approvalExpiry: string | null

  @Column({ type: 'integer', name: 'target_sample_size', nullable: true })
  targetSampleSize: number | null
}
