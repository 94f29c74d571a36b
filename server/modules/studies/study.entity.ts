import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { ResourceLink, SamplingCharacteristic, SamplingTarget, WithdrawalRule } from '../../../shared/schemas/recruitment.js'

@Entity('studies')
export class Study extends BaseEntity {
  @Index({ unique: true })
  @Column({ type: 'varchar', length: 20 })
  code: string

  @Column({ type: 'varchar', length: 200 })
  title: string

  @Column({ type: 'text', default: '' })
  summary: string

  @Column({ type: 'varchar', length: 200, name: 'ethics_board', default: '' })
  ethicsBoard: string

  @Column({ type: 'varchar', length: 100, name: 'ethics_reference', default: '' })
  ethicsReference: string

  @Column({ type: 'date', name: 'approval_date', nullable: true })
  approvalDate: string | null

  @Column({ type: 'date', name: 'approval_expiry', nullable: true })
  approvalExpiry: string | null

  @Column({ type: 'integer', name: 'target_sample_size', nullable: true })
  targetSampleSize: number | null

  /** recruitment: whether the public study page accepts enquiries */
  @Column({ type: 'boolean', default: false })
  recruiting: boolean

  @Column({ type: 'text', name: 'public_summary', default: '' })
  publicSummary: string

  @Column({ type: 'text', name: 'who_can_take_part', default: '' })
  whoCanTakePart: string

  @Column({ type: 'jsonb', name: 'sampling_characteristics', default: [] })
  samplingCharacteristics: SamplingCharacteristic[]

  @Column({ type: 'jsonb', name: 'sampling_targets', default: [] })
  samplingTargets: SamplingTarget[]

  @Column({ type: 'jsonb', default: [] })
  resources: ResourceLink[]

  @Column({ type: 'jsonb', name: 'withdrawal_rule', default: { kind: 'any_time' } })
  withdrawalRule: WithdrawalRule

  /** the last pseudonym number given out; bumped under a row lock so pseudonyms stay gapless */
  @Column({ type: 'integer', name: 'participant_sequence', default: 0 })
  participantSequence: number

  /** consistent de-identification placeholders across the study's transcripts (term → placeholder) */
  @Column({ type: 'jsonb', name: 'placeholder_registry', default: {} })
  placeholderRegistry: Record<string, { placeholder: string; category: string }>

  /** days after a withdrawal of data before the participant's transcript files are deleted from the store */
  @Column({ type: 'integer', name: 'data_removal_grace_days', default: 30 })
  dataRemovalGraceDays: number

  /** the team's own list of terms the de-identification scan always flags (local place names, a clinic…) */
  @Column({ type: 'jsonb', name: 'deidentification_terms', default: [] })
  deidentificationTerms: { term: string; category: string }[]

  /** coding: coders may show another coder's coding beside their own */
  @Column({ type: 'boolean', name: 'coder_comparison', default: false })
  coderComparison: boolean

  /** analysis: whether inter-coder agreement is computed (teams doing reflexive analysis switch it off) */
  @Column({ type: 'boolean', name: 'agreement_enabled', default: true })
  agreementEnabled: boolean

  /** analysis: the unit agreement compares, speaker turns or sentences */
  @Column({ type: 'varchar', length: 10, name: 'agreement_unit', default: 'turn' })
  agreementUnit: 'turn' | 'sentence'
}
