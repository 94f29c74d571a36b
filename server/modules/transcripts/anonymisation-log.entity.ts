import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

/**
 * Every replacement made in de-identification: the original term, its placeholder, who and when.
 * Identifiable: lead and coordinator only (UK Data Service, "Anonymising qualitative data": keep an
 * anonymisation log apart from the anonymised files).
 */
@Entity('anonymisation_log')
@Index(['studyId', 'at'])
export class AnonymisationLogEntry {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @CreateDateColumn({ type: 'timestamptz' })
  at: Date

  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'transcript_id' })
  transcriptId: string

  @Column({ type: 'varchar', length: 300 })
  original: string

  @Column({ type: 'varchar', length: 40 })
  placeholder: string

  @Column({ type: 'varchar', length: 30 })
  category: string

  @Column({ type: 'uuid', name: 'by_id', nullable: true })
  byId: string | null

  @Column({ type: 'varchar', length: 120, name: 'by_name', nullable: true })
  byName: string | null
}
