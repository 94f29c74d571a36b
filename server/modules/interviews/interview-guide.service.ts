import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { InterviewGuide as InterviewGuideDto, InterviewGuideCreate } from '../../../shared/schemas/interviews.js'
import { NotFoundError } from '../../lib/errors.js'
import type { ObjectStore } from '../../storage/object-store.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { InterviewGuide } from './interview-guide.entity.js'

/** Interview guide versions, kept like consent forms: the file in the object store with its SHA-256. */
export class InterviewGuideService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly storage: ObjectStore,
    private readonly audit: AuditService,
  ) {}

  private toDto(g: InterviewGuide): InterviewGuideDto {
    return { id: g.id, label: g.label, approvalDate: g.approvalDate, text: g.text, file: { name: g.fileName, contentType: g.fileContentType, size: g.fileSize, sha256: g.fileSha256 }, createdAt: g.createdAt.toISOString() }
  }

  async list(studyId: string): Promise<InterviewGuideDto[]> {
    return (await this.dataSource.getRepository(InterviewGuide).find({ where: { studyId }, order: { createdAt: 'DESC' } })).map((g) => this.toDto(g))
  }

  async create(studyId: string, input: InterviewGuideCreate, file: { buffer: Buffer; name: string; contentType: string }, actor: AuditActor): Promise<InterviewGuideDto> {
    const id = randomUUID()
    const key = `studies/${studyId}/interview-guides/${id}`
    const guide = await this.storage.putThen(key, file.buffer, file.contentType, (stored) =>
      this.dataSource.transaction(async (manager) => {
        const saved = await manager.save(
          manager.create(InterviewGuide, { id, studyId, ...input, fileKey: key, fileName: file.name, fileContentType: file.contentType, fileSize: stored.size, fileSha256: stored.sha256 }),
        )
        await this.audit.record(actor, { action: 'interview_guide.added', studyId, targetType: 'interview_guide', targetId: id, details: { label: input.label } }, manager)
        return saved
      }),
    )
    return this.toDto(guide)
  }

  async file(studyId: string, guideId: string) {
    const g = await this.dataSource.getRepository(InterviewGuide).findOneBy({ id: guideId, studyId })
    if (!g) throw new NotFoundError('interview guide')
    return { name: g.fileName, contentType: g.fileContentType, body: await this.storage.get(g.fileKey, g.fileSha256) }
  }
}
