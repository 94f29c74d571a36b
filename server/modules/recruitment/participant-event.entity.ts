import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

export type ParticipantEventKind = 'enquiry' | 'screening' | 'override' | 'email' | 'note'

/** A line of a participant's timeline: enquiry, screenings, decisions, e-mails. */
@Entity('participant_events')
@Index(['participantId', 'at'])
export class ParticipantEvent {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @CreateDateColumn({ type: 'timestamptz' })
  at: Date

  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'varchar', length: 20 })
  kind: ParticipantEventKind

  @Column({ type: 'varchar', length: 300 })
  summary: string

  @Column({ type: 'uuid', name: 'actor_id', nullable: true })
  actorId: string | null

  @Column({ type: 'varchar', length: 120, name: 'actor_name', nullable: true })
  actorName: string | null

  @Column({ type: 'jsonb', default: {} })
  details: Record<string, unknown>
}
