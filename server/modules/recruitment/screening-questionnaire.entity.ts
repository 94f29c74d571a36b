import { Column, Entity, Index, JoinColumn, ManyToOne, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { Question } from '../../../shared/schemas/recruitment.js'
import { Study } from '../studies/study.entity.js'

/** One version of a study's screening questionnaire. A version with screenings is never edited again. */
@Entity('screening_questionnaires')
@Index(['studyId', 'version'], { unique: true })
export class ScreeningQuestionnaire extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'integer' })
  version: number

  @Column({ type: 'text', default: '' })
  intro: string

  @Column({ type: 'jsonb', default: [] })
  questions: Question[]

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>
}
