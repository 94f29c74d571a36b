import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { SnapshotCode } from '../../../shared/schemas/coding.js'
import { Study } from '../studies/study.entity.js'

/** A saved copy of the whole codebook at one moment, to compare with later versions. */
@Entity('codebook_snapshots')
@Index(['studyId', 'createdAt'])
export class CodebookSnapshot extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'jsonb' })
  codes: SnapshotCode[]

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null

  @Column({ type: 'varchar', length: 200, name: 'created_by_name', default: '' })
  createdByName: string

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>
}
