import type { DataSource, EntityManager } from 'typeorm'
import { codebookToCsv, labelKey, planCodebookImport } from '../../../shared/coding/codebook-csv.js'
import { OKABE_ITO, type CodebookImport, type CodebookImportResult, type SnapshotDetail } from '../../../shared/schemas/coding.js'
import { NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { User } from '../users/user.entity.js'
import { CodebookSnapshot } from './codebook-snapshot.entity.js'
import { Code } from './code.entity.js'
import { labelTaken, lockCodebook } from './code.service.js'

/** The codebook in and out: CSV export and all-or-nothing import, and saved snapshots. */
export class CodebookTransferService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  async csv(studyId: string, bom: boolean): Promise<string> {
    const codes = await this.dataSource.getRepository(Code).find({ where: { studyId }, order: { position: 'ASC', createdAt: 'ASC' } })
    return codebookToCsv(codes, { bom })
  }

  async import(studyId: string, input: CodebookImport, actor: AuditActor): Promise<CodebookImportResult> {
    const dryRun = input.dryRun ?? false
    return this.dataSource.transaction(async (manager) => {
      await lockCodebook(manager, studyId)
      const existing = await manager.find(Code, { where: { studyId }, order: { position: 'ASC', createdAt: 'ASC' } })
      const plan = planCodebookImport(input.csv, existing)
      if (plan.errors.length) {
        throw new UnprocessableError(
          `The file has ${plan.errors.length} mistake${plan.errors.length === 1 ? '' : 's'}, so nothing was imported. Correct ${plan.errors.length === 1 ? 'it' : 'them'} and import the file again.`,
          plan.errors.map((e) => ({ path: `${e.row}.${e.column ?? 'file'}`, message: e.message })),
        )
      }
      const result = { created: plan.creates.length, updated: plan.updates.length, unchanged: plan.unchanged, dryRun }
      if (dryRun) return result
      const idByKey = new Map(existing.filter((c) => c.status !== 'merged').map((c) => [labelKey(c.label), c.id]))
      const parentOf = (label: string | null) => (label === null ? null : idByKey.get(labelKey(label)) ?? null)
      let total = existing.length
      for (const planned of plan.creates) {
        const parentId = parentOf(planned.parentLabel)
        const position = await this.siblingCount(manager, studyId, parentId)
        const saved = await manager
          .save(manager.create(Code, {
            studyId,
            parentId,
            position,
            label: planned.label,
            definition: planned.definition,
            whenToUse: planned.whenToUse,
            whenNotToUse: planned.whenNotToUse,
            colour: planned.colour ?? OKABE_ITO[total % OKABE_ITO.length]!.hex,
            status: planned.status,
          }))
          .catch((error: unknown) => labelTaken(error, planned.label))
        total++
        idByKey.set(labelKey(saved.label), saved.id)
      }
      for (const update of plan.updates) {
        const { parentLabel, ...fields } = update.changes
        const changes: Record<string, unknown> = { ...fields }
        if (parentLabel !== undefined) {
          changes.parentId = parentOf(parentLabel)
          changes.position = await this.siblingCount(manager, studyId, changes.parentId as string | null)
        }
        await manager.createQueryBuilder().update(Code).set({ ...changes, version: () => 'version + 1' } as never).where('id = :id AND study_id = :studyId', { id: update.id, studyId }).execute()
      }
      await this.audit.record(actor, { action: 'codebook.imported', studyId, targetType: 'study', targetId: studyId, details: { created: result.created, updated: result.updated } }, manager)
      return result
    })
  }

  private siblingCount(manager: EntityManager, studyId: string, parentId: string | null): Promise<number> {
    return manager.query(`SELECT count(*)::int AS n FROM codes WHERE study_id = $1 AND parent_id IS NOT DISTINCT FROM $2`, [studyId, parentId]).then((rows: { n: number }[]) => rows[0]!.n)
  }

  async snapshots(studyId: string) {
    const rows = await this.dataSource.getRepository(CodebookSnapshot).find({ where: { studyId }, order: { createdAt: 'DESC' }, take: 200 })
    return rows.map(summaryOf)
  }

  async snapshot(studyId: string, snapshotId: string): Promise<SnapshotDetail> {
    const row = await this.dataSource.getRepository(CodebookSnapshot).findOneBy({ id: snapshotId, studyId })
    if (!row) throw new NotFoundError('codebook snapshot')
    return { ...summaryOf(row), codes: row.codes }
  }

  async saveSnapshot(studyId: string, name: string, actor: AuditActor): Promise<SnapshotDetail> {
    const codes = await this.dataSource.getRepository(Code).find({ where: { studyId }, order: { position: 'ASC', createdAt: 'ASC' } })
    const by = actor.id ? ((await this.dataSource.getRepository(User).findOneBy({ id: actor.id }))?.name ?? '') : ''
    const saved = await this.dataSource.transaction(async (manager) => {
      const row = await manager.save(
        manager.create(CodebookSnapshot, {
          studyId,
          name,
          createdById: actor.id,
          createdByName: by,
          codes: codes.map((c) => ({ id: c.id, parentId: c.parentId, position: c.position, label: c.label, definition: c.definition, whenToUse: c.whenToUse, whenNotToUse: c.whenNotToUse, colour: c.colour, status: c.status })),
        }),
      )
      await this.audit.record(actor, { action: 'codebook.snapshot_saved', studyId, targetType: 'codebook_snapshot', targetId: row.id, details: { name, codes: codes.length } }, manager)
      return row
    })
    return { ...summaryOf(saved), codes: saved.codes }
  }
}

function summaryOf(row: CodebookSnapshot) {
  return { id: row.id, name: row.name, codeCount: row.codes.length, createdBy: row.createdByName, createdAt: row.createdAt.toISOString() }
}
