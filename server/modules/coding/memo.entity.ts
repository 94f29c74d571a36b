import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { MemoTarget } from '../../../shared/schemas/coding.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'

/**
 * A memo on the study, a transcript, an excerpt or a code, by one author. `version` is the optimistic
 * lock. The full-text index `memos_search_idx` is written by hand in the migration.
 */
@Entity('memos')
@Index(['studyId', 'targetType', 'targetId'])
@Index('memos_search_idx', { synchronize: false })
export class Memo extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'varchar', length: 12, name: 'target_type' })
  targetType: MemoTarget

  @Column({ type: 'uuid', name: 'target_id', nullable: true })
  targetId: string | null

  @Column({ type: 'text' })
  body: string

  @Column({ type: 'uuid', name: 'author_id' })
  authorId: string

  @Column({ type: 'integer', default: 1 })
  version: number

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'author_id' })
  author: Relation<User>
}
