import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'
import type { WithdrawalScope } from '../../../shared/schemas/consent.js'

/** A participant's withdrawal: one per participant, with its scope and whether the data left the analysis. */
@Entity('withdrawals')
export class Withdrawal {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt: Date

  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Index({ unique: true })
  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'varchar', length: 20 })
  scope: WithdrawalScope

  @Column({ type: 'date', name: 'effective_date' })
  effectiveDate: string

  @Column({ type: 'text', default: '' })
  reason: string

  @Column({ type: 'boolean', name: 'within_deadline' })
  withinDeadline: boolean

  @Column({ type: 'boolean', name: 'data_removed' })
  dataRemoved: boolean

  @Column({ type: 'text', name: 'decision_note', default: '' })
  decisionNote: string

  @Column({ type: 'uuid', name: 'recorded_by_id', nullable: true })
  recordedById: string | null

  @Column({ type: 'varchar', length: 120, name: 'recorded_by_name', nullable: true })
  recordedByName: string | null
}

/** A participant's own request to withdraw, from the link in their consent receipt; lands in the team's queue. */
@Entity('withdrawal_requests')
@Index(['studyId', 'status'])
export class WithdrawalRequest {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @CreateDateColumn({ type: 'timestamptz', name: 'requested_at' })
  requestedAt: Date

  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'varchar', length: 20 })
  scope: WithdrawalScope

  @Column({ type: 'text', default: '' })
  reason: string

  @Column({ type: 'varchar', length: 20, default: 'open' })
  status: 'open' | 'recorded'
}
