import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { ParticipantStatus, ReferralSource } from '../../../shared/schemas/recruitment.js'
import { Study } from '../studies/study.entity.js'

/**
 * A person who enquired, known to the team by a pseudonym (P01, P02, …). Nothing identifying lives
 * here: contact details are in ParticipantContact, readable only by the lead and coordinators.
 */
@Entity('participants')
@Index(['studyId', 'sequence'], { unique: true })
@Index(['studyId', 'pseudonym'], { unique: true })
@Index(['studyId', 'status'])
export class Participant extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'integer' })
  sequence: number

  @Column({ type: 'varchar', length: 12 })
  pseudonym: string

  @Column({ type: 'varchar', length: 20 })
  status: ParticipantStatus

  @Column({ type: 'boolean', name: 'help_seeking', default: false })
  helpSeeking: boolean

  @Column({ type: 'varchar', length: 30 })
  source: ReferralSource

  @Column({ type: 'varchar', length: 200, name: 'source_detail', default: '' })
  sourceDetail: string

  @Column({ type: 'jsonb', default: {} })
  characteristics: Record<string, string>

  /** the lead's decision when it differs from the computed outcome */
  @Column({ type: 'jsonb', nullable: true })
  override: { outcome: 'eligible' | 'not_eligible'; reason: string; by: string; at: string } | null

  @Column({ type: 'timestamptz', name: 'last_activity_at', default: () => 'now()' })
  lastActivityAt: Date

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>
}
