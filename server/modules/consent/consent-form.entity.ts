import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'
import type { ConsentClause, ConsentFormStatus } from '../../../shared/schemas/consent.js'

/** A version of a study's consent form: the approved file in the object store, its text and its clauses. */
@Entity('consent_forms')
@Index(['studyId', 'status'])
export class ConsentForm extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'varchar', length: 60 })
  label: string

  @Column({ type: 'varchar', length: 20, default: 'draft' })
  status: ConsentFormStatus

  @Column({ type: 'date', name: 'ethics_approval_date' })
  ethicsApprovalDate: string

  @Column({ type: 'date', name: 'effective_date' })
  effectiveDate: string

  @Column({ type: 'jsonb', default: [] })
  clauses: ConsentClause[]

  @Column({ type: 'text' })
  text: string

  @Column({ type: 'varchar', length: 200, name: 'file_key' })
  fileKey: string

  @Column({ type: 'varchar', length: 200, name: 'file_name' })
  fileName: string

  @Column({ type: 'varchar', length: 120, name: 'file_content_type' })
  fileContentType: string

  @Column({ type: 'integer', name: 'file_size' })
  fileSize: number

  @Column({ type: 'char', length: 64, name: 'file_sha256' })
  fileSha256: string

  /** SHA-256 over the file's hash and the text shown to participants: what signatures bind to */
  @Column({ type: 'char', length: 64, name: 'document_sha256' })
  documentSha256: string

  @Column({ type: 'jsonb', default: {} })
  checklist: Record<string, boolean>

  @Column({ type: 'timestamptz', name: 'approved_at', nullable: true })
  approvedAt: Date | null

  @Column({ type: 'uuid', name: 'approved_by_id', nullable: true })
  approvedById: string | null

  @Column({ type: 'uuid', name: 'created_by_id', nullable: true })
  createdById: string | null
}
