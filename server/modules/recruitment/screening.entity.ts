import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm'
import type { Answers, EligibilityResult } from '../../../shared/schemas/recruitment.js'
import { Participant } from './participant.entity.js'
import { ScreeningQuestionnaire } from './screening-questionnaire.entity.js'

/** One screening: the answers, the questionnaire version they answered, and the computed result. */
@Entity('screenings')
@Index(['participantId', 'at'])
export class Screening {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @CreateDateColumn({ type: 'timestamptz' })
  at: Date

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'uuid', name: 'questionnaire_id' })
  questionnaireId: string

  @Column({ type: 'jsonb' })
  answers: Answers

  @Column({ type: 'jsonb' })
  result: EligibilityResult

  @Column({ type: 'uuid', name: 'screened_by_id', nullable: true })
  screenedById: string | null

  @ManyToOne(() => Participant, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'participant_id' })
  participant: Relation<Participant>

  @ManyToOne(() => ScreeningQuestionnaire, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'questionnaire_id' })
  questionnaire: Relation<ScreeningQuestionnaire>
}
