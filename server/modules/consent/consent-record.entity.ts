import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from 'typeorm'
import type { ConsentMethod } from '../../../shared/schemas/consent.js'

/**
 * One act of consent, never edited (a trigger refuses UPDATE and DELETE): a correction is a new
 * record pointing to the one it corrects. It keeps the version's document hash, so a signature
 * cannot be moved to another version (21 CFR 11.70), and name, time and meaning (21 CFR 11.50).
 */
@Entity('consent_records')
@Index(['participantId', 'signedAt'])
export class ConsentRecord {
  @PrimaryColumn({ type: 'uuid' })
  id: string

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt: Date

  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'uuid', name: 'participant_id' })
  participantId: string

  @Column({ type: 'uuid', name: 'form_id' })
  formId: string

  @Column({ type: 'varchar', length: 20 })
  method: ConsentMethod

  @Column({ type: 'jsonb' })
  clauses: Record<string, boolean>

  @Column({ type: 'varchar', length: 120, name: 'signer_name' })
  signerName: string

  @Column({ type: 'timestamptz', name: 'signed_at' })
  signedAt: Date

  @Column({ type: 'varchar', length: 300 })
  meaning: string

  @Column({ type: 'uuid', name: 'obtained_by_id', nullable: true })
  obtainedById: string | null

  @Column({ type: 'varchar', length: 120, name: 'obtained_by_name', nullable: true })
  obtainedByName: string | null

  @Column({ type: 'varchar', length: 120, name: 'witness_name', default: '' })
  witnessName: string

  @Column({ type: 'char', length: 64, name: 'document_sha256' })
  documentSha256: string

  @Column({ type: 'varchar', length: 200, name: 'signed_file_key', nullable: true })
  signedFileKey: string | null

  @Column({ type: 'varchar', length: 200, name: 'signed_file_name', nullable: true })
  signedFileName: string | null

  @Column({ type: 'char', length: 64, name: 'signed_file_sha256', nullable: true })
  signedFileSha256: string | null

  @Column({ type: 'varchar', length: 200, name: 'receipt_key', nullable: true })
  receiptKey: string | null

  /** keyed hash of the signer's network address (electronic consent only) */
  @Column({ type: 'char', length: 64, name: 'address_hash', nullable: true })
  addressHash: string | null

  @Column({ type: 'varchar', length: 300, name: 'user_agent', nullable: true })
  userAgent: string | null

  /** the SHA-256 of the participant's withdrawal link token (electronic consent receipt) */
  @Index({ unique: true, where: 'withdrawal_token_hash IS NOT NULL' })
  @Column({ type: 'char', length: 64, name: 'withdrawal_token_hash', nullable: true })
  withdrawalTokenHash: string | null

  @Column({ type: 'uuid', name: 'corrects_id', nullable: true })
  correctsId: string | null

  @Column({ type: 'text', default: '' })
  note: string
}
