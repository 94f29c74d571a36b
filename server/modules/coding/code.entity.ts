import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { CodeStatus } from '../../../shared/schemas/coding.js'
import { Study } from '../studies/study.entity.js'

/**
 * A code of a study's codebook. Codes nest (`parentId`) and are ordered among their siblings
 * (`position`). A merged code stays in the book pointing at the code that took its excerpts; a
 * retired one stays on its excerpts but is not offered for new coding. `version` is the optimistic
 * lock: every change is `UPDATE … WHERE id = $1 AND version = $2` (code.service.ts).
 * Labels are unique per study among codes that are not merged (index `codes_study_label_unique`,
 * case-insensitive, written by hand in the migration).
 */
@Entity('codes')
@Index(['studyId', 'parentId', 'position'])
@Index('codes_study_label_unique', { synchronize: false })
export class Code extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'parent_id', nullable: true })
  parentId: string | null

  @Column({ type: 'integer', default: 0 })
  position: number

  @Column({ type: 'varchar', length: 80 })
  label: string

  @Column({ type: 'text', default: '' })
  definition: string

  @Column({ type: 'text', name: 'when_to_use', default: '' })
  whenToUse: string

  @Column({ type: 'text', name: 'when_not_to_use', default: '' })
  whenNotToUse: string

  @Column({ type: 'uuid', name: 'example_excerpt_id', nullable: true })
  exampleExcerptId: string | null

  @Column({ type: 'varchar', length: 7 })
  colour: string

  @Column({ type: 'varchar', length: 10, default: 'active' })
  status: CodeStatus

  @Column({ type: 'uuid', name: 'merged_into_id', nullable: true })
  mergedIntoId: string | null

  @Column({ type: 'integer', default: 1 })
  version: number

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>

  @ManyToOne(() => Code, { onDelete: 'SET NULL' })
  @JoinColumn({ name: 'parent_id' })
  parent: Relation<Code> | null
}
