import { Column, Entity, Index } from 'typeorm'
import { BaseEntity } from '../../db/base.entity.js'

/** A version of the study's interview guide: label, approval date, the file and its text. */
@Entity('interview_guides')
@Index(['studyId', 'createdAt'])
export class InterviewGuide extends BaseEntity {
  @Column({ type: 'uuid', name: 'study_id' })
  studyId: string

  @Column({ type: 'varchar', length: 60 })
  label: string

  @Column({ type: 'date', name: 'approval_date' })
  approvalDate: string

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
}
