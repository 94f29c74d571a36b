import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

/** One line of the append-only audit trail; a database trigger refuses UPDATE and DELETE. */
@Entity('audit_events')
@Index(['studyId', 'at'])
export class AuditEvent {
  @PrimaryGeneratedColumn('increment', { type: 'bigint' })
  id: string

  @CreateDateColumn({ type: 'timestamptz' })
  at: Date

  @Column({ type: 'uuid', name: 'study_id', nullable: true })
  studyId: string | null

  @Column({ type: 'uuid', name: 'actor_id', nullable: true })
  actorId: string | null

  @Column({ type: 'varchar', length: 254, name: 'actor_email', nullable: true })
  actorEmail: string | null

  @Column({ type: 'varchar', length: 60 })
  action: string

  @Column({ type: 'varchar', length: 40, name: 'target_type', nullable: true })
  targetType: string | null

  @Column({ type: 'varchar', length: 64, name: 'target_id', nullable: true })
  targetId: string | null

  @Column({ type: 'varchar', length: 64, nullable: true })
  ip: string | null

  @Column({ type: 'jsonb', default: {} })
  details: Record<string, unknown>
}
