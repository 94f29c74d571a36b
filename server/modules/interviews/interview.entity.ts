import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'

/** An interview, stored in UTC with both people's IANA time zones. */
@Entity('interviews')
@Index(['studyId', 'scheduledAt'])
@Index(['participantId'])
export class Interview extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'timestamptz', name: 'scheduled_at' })
  scheduledAt: Date

  @Column({ type: 'varchar', length: 60, name: 'participant_time_zone' })
  participantTimeZone: string

  @Column({ type: 'uuid', name: 'interviewer_id' })
  interviewerId: string

  @Column({ type: 'varchar', length: 60, name: 'interviewer_time_zone' })
  interviewerTimeZone: string

  @Column({ type: 'varchar', length: 20 })
  mode: 'video' | 'phone' | 'in_person'

  @Column({ type: 'integer', name: 'planned_minutes' })
  plannedMinutes: number

  @Column({ type: 'integer', name: 'actual_minutes', nullable: true })
  actualMinutes: number | null

  @Column({ type: 'uuid', name: 'guide_id', nullable: true })
  guideId: string | null

  @Column({ type: 'text', name: 'field_notes', default: '' })
  fieldNotes: string

  @Column({ type: 'varchar', length: 20, default: 'scheduled' })
  status: 'scheduled' | 'done' | 'missed' | 'cancelled'

  /** the participant declined audio recording: field notes only */
  @Column({ type: 'boolean', name: 'notes_only', default: false })
  notesOnly: boolean

  /** iCalendar SEQUENCE: goes up with each change so calendars replace the event (RFC 5545 §3.8.7.4) */
  @Column({ type: 'integer', name: 'calendar_sequence', default: 0 })
  calendarSequence: number
}
