import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import { Transcript } from '../transcripts/transcript.entity.js'
import { User } from '../users/user.entity.js'
import { Code } from './code.entity.js'

/**
 * One coder's passage of one transcript version: `[start, end)` in UTF-16 code units of the approved,
 * de-identified text, with a copy of that text for search and quotes. Each excerpt is its own row,
 * so coders never overwrite each other; `version` is the optimistic lock. The full-text index
 * `excerpts_search_idx` is written by hand in the migration.
 */
@Entity('excerpts')
@Index(['transcriptId', 'coderId'])
@Index(['studyId', 'coderId'])
@Index('excerpts_search_idx', { synchronize: false })
export class Excerpt extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'transcript_id' })
  transcriptId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'uuid', name: 'coder_id' })
  coderId: string

  @Column({ type: 'integer', name: 'start_offset' })
  start: number

  @Column({ type: 'integer', name: 'end_offset' })
  end: number

  @Column({ type: 'text' })
  text: string

  @Column({ type: 'integer', default: 1 })
  version: number

  @ManyToOne(() => Transcript, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'transcript_id' })
  transcript: Relation<Transcript>

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'coder_id' })
  coder: Relation<User>
}

/** A code applied to an excerpt. */
@Entity('excerpt_codes')
@Index(['codeId'])
export class ExcerptCode {
  @PrimaryColumn({ type: 'uuid', name: 'excerpt_id' })
  excerptId: string

  @PrimaryColumn({ type: 'uuid', name: 'code_id' })
  codeId: string

  @ManyToOne(() => Excerpt, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'excerpt_id' })
  excerpt: Relation<Excerpt>

  @ManyToOne(() => Code, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'code_id' })
  code: Relation<Code>
}
