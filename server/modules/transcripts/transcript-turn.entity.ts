import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

/** A speaker turn of an approved transcript; offsets are into its de-identified text. */
@Entity('transcript_turns')
@Index(['transcriptId', 'position'], { unique: true })
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
}
