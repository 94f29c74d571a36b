import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { Verdict } from '../../../shared/schemas/themes.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'

/** A round in which patient partners read a set of themes and answer them by a closing date. */
@Entity('review_rounds')
@Index(['studyId', 'createdAt'])
export class ReviewRound extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'varchar', length: 160 })
  title: string

  @Column({ type: 'date', name: 'closes_on' })
  closesOn: string

  @Column({ type: 'varchar', length: 10, default: 'open' })
  status: 'open' | 'closed'

  @Column({ type: 'jsonb', name: 'show_characteristics', default: [] })
  showCharacteristics: string[]

  @Column({ type: 'text', default: '' })
  message: string

  @Column({ type: 'timestamptz', name: 'closed_at', nullable: true })
  closedAt: Date | null

  @ManyToOne(() => Study, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study: Relation<Study>
}

/** A theme in a round; its name is kept so answers still read well if the theme is later deleted. */
@Entity('review_round_themes')
export class ReviewRoundTheme {
  @PrimaryColumn({ type: 'uuid', name: 'round_id' })
  roundId: string

  @PrimaryColumn({ type: 'uuid', name: 'theme_id' })
  themeId: string

  @Column({ type: 'varchar', length: 120, name: 'theme_name' })
  themeName: string

  @Column({ type: 'integer', default: 0 })
  position: number

  @ManyToOne(() => ReviewRound, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'round_id' })
  round: Relation<ReviewRound>
}

/** One partner's answer to one theme of a round: a draft until submitted; the team's response beside it. */
@Entity('partner_answers')
@Index(['roundId', 'themeId', 'partnerId'], { unique: true })
export class PartnerAnswer extends BaseEntity {
  @Column({ type: 'uuid', name: 'round_id' })
  roundId: string

  @Column({ type: 'uuid', name: 'theme_id' })
  themeId: string

  @Column({ type: 'uuid', name: 'partner_id' })
  partnerId: string

  @Column({ type: 'varchar', length: 20, nullable: true })
  verdict: Verdict | null

  @Column({ type: 'text', default: '' })
  comment: string

  @Column({ type: 'text', default: '' })
  note: string

  @Column({ type: 'boolean', name: 'share_note', default: false })
  shareNote: boolean

  @Column({ type: 'timestamptz', name: 'submitted_at', nullable: true })
  submittedAt: Date | null

  @Column({ type: 'text', default: '' })
  response: string

  @Column({ type: 'timestamptz', name: 'responded_at', nullable: true })
  respondedAt: Date | null

  @ManyToOne(() => ReviewRound, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'round_id' })
  round: Relation<ReviewRound>

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'partner_id' })
  partner: Relation<User>
}
