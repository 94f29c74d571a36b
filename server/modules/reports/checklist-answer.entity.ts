import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn, type Relation } from 'typeorm'
import type { ChecklistName } from '../../../shared/schemas/reports.js'
import { Study } from '../studies/study.entity.js'

/** Where a study's paper addresses one reporting-checklist item, a note, and whether it is done. */
@Entity('checklist_answers')
export class ChecklistAnswer {
  @PrimaryColumn({ type: 'uuid', name: 'study_id' })
  studyId: string

  @PrimaryColumn({ type: 'varchar', length: 10 })
  checklist: ChecklistName

  @PrimaryColumn({ type: 'varchar', length: 4 })
  number: string

  @Column({ type: 'text', name: 'where_addressed', default: '' })
  where: string

  @Column({ type: 'text', default: '' })
  note: string

  @Column({ type: 'boolean', default: false })
  done: boolean

  @UpdateDateColumn({ type: 'timestamptz', name: 'updated_at' })
  updatedAt: Date

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>
}
