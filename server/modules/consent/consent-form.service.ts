import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { ConsentForm as ConsentFormDto, ConsentFormCreate, ConsentFormUpdate } from '../../../shared/schemas/consent.js'
import { ConflictError, NotFoundError, ValidationError } from '../../lib/errors.js'
import { sha256 } from '../../lib/hash.js'
import type { ObjectStore } from '../../storage/object-store.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { User } from '../users/user.entity.js'
import { ConsentForm } from './consent-form.entity.js'
import { ConsentRecord } from './consent-record.entity.js'

/** What a signature binds to: the exact file and the exact text participants were shown. */
export function documentHash(fileSha256: string, text: string): string {
  return sha256(`${fileSha256}\n${text}`)
}

function clauseProblems(input: Pick<ConsentFormCreate, 'clauses' | 'ethicsApprovalDate' | 'effectiveDate'>) {
  const problems = []
  const keys = input.clauses.map((c) => c.key)
  if (new Set(keys).size !== keys.length) problems.push({ path: 'clauses', message: 'Each clause needs its own key.' })
  if (input.effectiveDate < input.ethicsApprovalDate) problems.push({ path: 'effectiveDate', message: 'The form cannot take effect before the ethics board approved it.' })
  return problems
}

export class ConsentFormService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly storage: ObjectStore,
    private readonly audit: AuditService,
  ) {}

  async toDto(form: ConsentForm): Promise<ConsentFormDto> {
    const [consentCount, approver] = await Promise.all([
      this.dataSource.getRepository(ConsentRecord).countBy({ formId: form.id }),
      form.approvedById ? this.dataSource.getRepository(User).findOneBy({ id: form.approvedById }) : null,
    ])
    return {
      id: form.id,
      label: form.label,
      status: form.status,
      ethicsApprovalDate: form.ethicsApprovalDate,
      effectiveDate: form.effectiveDate,
      clauses: form.clauses,
      text: form.text,
      file: { name: form.fileName, contentType: form.fileContentType, size: form.fileSize, sha256: form.fileSha256 },
      documentSha256: form.documentSha256,
      checklist: form.checklist,
      approvedAt: form.approvedAt?.toISOString() ?? null,
      approvedBy: approver?.name ?? null,
      createdAt: form.createdAt.toISOString(),
      consentCount,
    }
  }

  async list(studyId: string): Promise<ConsentFormDto[]> {
    const forms = await this.dataSource.getRepository(ConsentForm).find({ where: { studyId }, order: { createdAt: 'DESC' } })
    return Promise.all(forms.map((f) => this.toDto(f)))
  }

  async get(studyId: string, formId: string): Promise<ConsentForm> {
    const form = await this.dataSource.getRepository(ConsentForm).findOneBy({ id: formId, studyId })
    if (!form) throw new NotFoundError('consent form version')
    return form
  }

  /** Stores the file first, then the row; if the row fails, the file is removed again (no orphans). */
  async create(studyId: string, input: ConsentFormCreate, file: { buffer: Buffer; name: string; contentType: string }, actor: AuditActor): Promise<ConsentFormDto> {
    const problems = clauseProblems(input)
    if (problems.length) throw new ValidationError(problems[0]!.message, problems)
    const id = randomUUID()
    const key = `studies/${studyId}/consent-forms/${id}`
    const form = await this.storage.putThen(key, file.buffer, file.contentType, (stored) =>
      this.dataSource.transaction(async (manager) => {
        const saved = await manager.save(
          manager.create(ConsentForm, {
            id,
            studyId,
            label: input.label,
            status: 'draft',
            ethicsApprovalDate: input.ethicsApprovalDate,
            effectiveDate: input.effectiveDate,
            clauses: input.clauses,
            text: input.text,
            fileKey: key,
            fileName: file.name,
            fileContentType: file.contentType,
            fileSize: stored.size,
            fileSha256: stored.sha256,
            documentSha256: documentHash(stored.sha256, input.text),
            createdById: actor.id,
          }),
        )
        await this.audit.record(actor, { action: 'consent_form.added', studyId, targetType: 'consent_form', targetId: id, details: { label: input.label, sha256: stored.sha256 } }, manager)
        return saved
      }),
    )
    return this.toDto(form)
  }

  /** Drafts can change; approved and superseded versions only take checklist ticks. */
  async update(studyId: string, formId: string, input: ConsentFormUpdate, actor: AuditActor): Promise<ConsentFormDto> {
    const form = await this.dataSource.transaction(async (manager) => {
      const found = await manager.findOne(ConsentForm, { where: { id: formId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!found) throw new NotFoundError('consent form version')
      const { checklist, ...content } = input
      const changesContent = Object.values(content).some((v) => v !== undefined)
      if (changesContent && found.status !== 'draft') throw new ConflictError('An approved version cannot change. Add a new version instead.')
      const next = { ...found, ...Object.fromEntries(Object.entries(content).filter(([, v]) => v !== undefined)) } as ConsentForm
      const problems = clauseProblems(next)
      if (problems.length) throw new ValidationError(problems[0]!.message, problems)
      if (checklist) next.checklist = { ...found.checklist, ...checklist }
      next.documentSha256 = documentHash(found.fileSha256, next.text)
      await manager.save(ConsentForm, next)
      await this.audit.record(actor, { action: 'consent_form.updated', studyId, targetType: 'consent_form', targetId: formId, details: { fields: Object.keys(input) } }, manager)
      return next
    })
    return this.toDto(form)
  }

  /** Approving a version supersedes the one approved before it. */
  async approve(studyId: string, formId: string, actor: AuditActor): Promise<ConsentFormDto> {
    const form = await this.dataSource.transaction(async (manager) => {
      const found = await manager.findOne(ConsentForm, { where: { id: formId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!found) throw new NotFoundError('consent form version')
      if (found.status !== 'draft') throw new ConflictError(`Version ${found.label} is already ${found.status}.`)
      const previous = await manager.findBy(ConsentForm, { studyId, status: 'approved' })
      await manager.update(ConsentForm, { studyId, status: 'approved' }, { status: 'superseded' })
      await manager.update(ConsentForm, { id: formId }, { status: 'approved', approvedAt: new Date(), approvedById: actor.id })
      await this.audit.record(
        actor,
        { action: 'consent_form.approved', studyId, targetType: 'consent_form', targetId: formId, details: { label: found.label, supersedes: previous.map((p) => p.label) } },
        manager,
      )
      return manager.findOneByOrFail(ConsentForm, { id: formId })
    })
    return this.toDto(form)
  }

  async file(studyId: string, formId: string): Promise<{ name: string; contentType: string; body: Buffer }> {
    const form = await this.get(studyId, formId)
    return { name: form.fileName, contentType: form.fileContentType, body: await this.storage.get(form.fileKey, form.fileSha256) }
  }
}
