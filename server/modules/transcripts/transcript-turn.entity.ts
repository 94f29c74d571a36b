import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

/** A speaker turn of an approved transcript; offsets are into its de-identified text. */
@Entity('transcript_turns')
@Index(['transcriptId', 'position'], { unique: true })
@Index('transcript_turns_search_idx', { synchronize: false })
export class TranscriptTurn {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'uuid', name: 'transcript_id' })
  transcriptId: string

  @Column({ type: 'integer' })
  position: number

  @Column({ type: 'varchar', length: 80 })
  speaker: string

  @Column({ type: 'integer', name: 'start_ms', nullable: true })
  startMs: number | null

  @Column({ type: 'integer', name: 'start_offset' })
  start: number

  @Column({ type: 'integer', name: 'end_offset' })
  end: number

  /** the turn's de-identified text, for full-text search (cleared when the participant's data is purged) */
  @Column({ type: 'text', nullable: true })
  text: string | null
}
