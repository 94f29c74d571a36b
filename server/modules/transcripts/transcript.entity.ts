import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { Flag, TranscriptStatus } from '../../../shared/schemas/interviews.js'

/**
 * One version of an interview's transcript. While in review, the raw upload and the parsed,
 * identifiable text live only under a quarantine prefix; on approval the de-identified text is stored
 * with its SHA-256 and the quarantine objects are deleted.
 */
@Entity('transcripts')
@Index(['interviewId', 'version'], { unique: true })
@Index(['studyId', 'status'])
export class Transcript extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'interview_id' })
  interviewId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'integer' })
  version: number

  @Column({ type: 'varchar', length: 20, default: 'in_review' })
  status: TranscriptStatus

  @Column({ type: 'varchar', length: 10 })
  format: string

  @Column({ type: 'integer', name: 'word_count', default: 0 })
  wordCount: number

  @Column({ type: 'varchar', length: 200, name: 'quarantine_prefix', nullable: true })
  quarantinePrefix: string | null

  @Column({ type: 'jsonb', default: [] })
  flags: Flag[]

  @Column({ type: 'varchar', length: 200, name: 'object_key', nullable: true })
  objectKey: string | null

  @Column({ type: 'char', length: 64, nullable: true })
  sha256: string | null

  @Column({ type: 'uuid', name: 'uploaded_by_id', nullable: true })
  uploadedById: string | null

  @Column({ type: 'uuid', name: 'approved_by_id', nullable: true })
  approvedById: string | null

  @Column({ type: 'timestamptz', name: 'approved_at', nullable: true })
  approvedAt: Date | null

  /** when the file was deleted from the store after the participant withdrew their data */
  @Column({ type: 'timestamptz', name: 'purged_at', nullable: true })
  purgedAt: Date | null
}
