import { IsNull, type DataSource, type EntityManager } from 'typeorm'
import type { Code as CodeDto, CodeMerge, CodeMove, CodeSplit } from '../../../shared/schemas/coding.js'
import { ConflictError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { Code } from './code.entity.js'
import { labelTaken, lockCodebook, type CodeService } from './code.service.js'
import { staleError, updateWithVersion } from './versioned-update.js'

/** Reshaping the codebook: nesting and ordering, merging two codes, splitting one. Audited. */
export class CodeStructureService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly codes: CodeService,
  ) {}

  async move(studyId: string, codeId: string, input: CodeMove, actor: AuditActor): Promise<CodeDto[]> {
    await this.dataSource.transaction(async (manager) => {
      await lockCodebook(manager, studyId)
      const code = await this.live(manager, studyId, codeId, input.version)
      if (input.parentId) {
        await this.codes.usableParent(manager, studyId, input.parentId)
        if (await this.isWithin(manager, studyId, input.parentId, codeId))
          throw new UnprocessableError('A code cannot be nested inside itself or one of its own sub-codes.', [{ path: 'parentId', message: 'Choose a code outside this branch.' }])
      }
      const siblings = await manager.find(Code, { where: { studyId, parentId: input.parentId ?? IsNull() }, order: { position: 'ASC', createdAt: 'ASC' } })
      const order = siblings.filter((s) => s.id !== codeId)
      order.splice(Math.min(input.position, order.length), 0, code)
      await updateWithVersion(manager, Code, { id: codeId, studyId }, input.version, { parentId: input.parentId }, 'code')
      await this.renumber(manager, order.map((c) => c.id))
      if (code.parentId !== input.parentId) await this.renumberChildren(manager, studyId, code.parentId)
      await this.audit.record(actor, { action: 'code.moved', studyId, targetType: 'code', targetId: codeId, details: { label: code.label, parentId: input.parentId, position: input.position } }, manager)
    })
    return this.codes.list(studyId)
  }

  /** The source's excerpts move to the target; an excerpt carrying both keeps one. The source stays, marked merged. */
  async merge(studyId: string, codeId: string, input: CodeMerge, actor: AuditActor): Promise<CodeDto[]> {
    if (codeId === input.intoId) throw new UnprocessableError('Choose another code to merge into: a code cannot merge into itself.', [{ path: 'intoId', message: 'Choose another code.' }])
    await this.dataSource.transaction(async (manager) => {
      await lockCodebook(manager, studyId)
      const source = await this.live(manager, studyId, codeId, input.version)
      const target = await manager.findOneBy(Code, { id: input.intoId, studyId })
      if (!target) throw new UnprocessableError('The code to merge into is not in this codebook.', [{ path: 'intoId', message: 'Choose a code from this codebook.' }])
      if (target.status === 'merged') throw new UnprocessableError('That code was itself merged into another. Merge into the code it went to.', [{ path: 'intoId', message: 'Choose an unmerged code.' }])
      const [, duplicates] = await manager.query(
        `DELETE FROM excerpt_codes ec WHERE ec.code_id = $1 AND EXISTS (SELECT 1 FROM excerpt_codes x WHERE x.excerpt_id = ec.excerpt_id AND x.code_id = $2)`,
        [source.id, target.id],
      )
      const [, moved] = await manager.query(`UPDATE excerpt_codes SET code_id = $2 WHERE code_id = $1`, [source.id, target.id])
      // the source's sub-codes go under the target (the target itself, if it was one, takes the source's place)
      if (target.parentId === source.id) await manager.update(Code, { id: target.id }, { parentId: source.parentId })
      await manager.query(`UPDATE codes SET parent_id = $2 WHERE parent_id = $1 AND id <> $2`, [source.id, target.id])
      await manager.query(`UPDATE codes SET merged_into_id = $2 WHERE merged_into_id = $1`, [source.id, target.id])
      // themes that drew on the source now draw on the target
      await manager.query(`INSERT INTO theme_codes (theme_id, code_id) SELECT theme_id, $2 FROM theme_codes WHERE code_id = $1 ON CONFLICT DO NOTHING`, [source.id, target.id])
      await manager.query(`DELETE FROM theme_codes WHERE code_id = $1`, [source.id])
      if (target.exampleExcerptId === null && source.exampleExcerptId) await manager.update(Code, { id: target.id }, { exampleExcerptId: source.exampleExcerptId })
      await updateWithVersion(manager, Code, { id: source.id, studyId }, input.version, { status: 'merged', mergedIntoId: target.id, exampleExcerptId: null }, 'code')
      await this.renumberChildren(manager, studyId, target.id)
      await this.audit.record(actor, {
        action: 'code.merged',
        studyId,
        targetType: 'code',
        targetId: source.id,
        details: { from: source.label, into: target.label, intoId: target.id, excerptsMoved: Number(moved), alreadyCarriedTarget: Number(duplicates) },
      }, manager)
    })
    return this.codes.list(studyId)
  }

  /** A new code beside this one takes over the chosen excerpts. */
  async split(studyId: string, codeId: string, input: CodeSplit, actor: AuditActor): Promise<CodeDto[]> {
    await this.dataSource.transaction(async (manager) => {
      await lockCodebook(manager, studyId)
      const source = await this.live(manager, studyId, codeId, input.version)
      const ids = [...new Set(input.excerptIds)]
      const carrying: { excerpt_id: string }[] = await manager.query(
        `SELECT ec.excerpt_id FROM excerpt_codes ec JOIN excerpts e ON e.id = ec.excerpt_id WHERE ec.code_id = $1 AND e.study_id = $2 AND ec.excerpt_id = ANY($3::uuid[])`,
        [source.id, studyId, ids],
      )
      if (carrying.length !== ids.length)
        throw new UnprocessableError(`${ids.length - carrying.length} of the chosen excerpts do not carry “${source.label}” (someone may have recoded them). Reload and choose again.`, [{ path: 'excerptIds', message: 'Choose excerpts of this code.' }])
      await manager.query(`UPDATE codes SET position = position + 1 WHERE study_id = $1 AND parent_id IS NOT DISTINCT FROM $2 AND position > $3`, [studyId, source.parentId, source.position])
      const created = await manager
        .save(manager.create(Code, {
          studyId,
          parentId: source.parentId,
          position: source.position + 1,
          label: input.newCode.label,
          definition: input.newCode.definition ?? '',
          whenToUse: input.newCode.whenToUse ?? '',
          whenNotToUse: input.newCode.whenNotToUse ?? '',
          colour: input.newCode.colour ?? source.colour,
          status: 'active',
        }))
        .catch((error: unknown) => labelTaken(error, input.newCode.label))
      await manager.query(`UPDATE excerpt_codes SET code_id = $2 WHERE code_id = $1 AND excerpt_id = ANY($3::uuid[])`, [source.id, created.id, ids])
      const exampleMoves = source.exampleExcerptId && ids.includes(source.exampleExcerptId)
      await updateWithVersion(manager, Code, { id: source.id, studyId }, input.version, exampleMoves ? { exampleExcerptId: null } : {}, 'code')
      if (exampleMoves) await manager.update(Code, { id: created.id }, { exampleExcerptId: source.exampleExcerptId })
      await this.audit.record(actor, { action: 'code.split', studyId, targetType: 'code', targetId: source.id, details: { from: source.label, newCode: created.label, newCodeId: created.id, excerptsMoved: ids.length } }, manager)
    })
    return this.codes.list(studyId)
  }

  /** The code, unmerged, at the version the caller saw. */
  private async live(manager: EntityManager, studyId: string, codeId: string, version: number): Promise<Code> {
    const code = await manager.findOneBy(Code, { id: codeId, studyId })
    if (!code) throw new NotFoundError('code')
    if (code.version !== version) throw staleError('code', version, code.version)
    if (code.status === 'merged') throw new ConflictError('This code was already merged into another one.')
    return code
  }

  /** Whether `candidate` is `ancestor` or lies below it. */
  private async isWithin(manager: EntityManager, studyId: string, candidate: string, ancestor: string): Promise<boolean> {
    const rows: { id: string }[] = await manager.query(
      `WITH RECURSIVE up(id, parent_id, depth) AS (
         SELECT id, parent_id, 0 FROM codes WHERE id = $1 AND study_id = $2
         UNION ALL SELECT c.id, c.parent_id, up.depth + 1 FROM codes c JOIN up ON c.id = up.parent_id WHERE up.depth < 100)
       SELECT id FROM up WHERE id = $3`,
      [candidate, studyId, ancestor],
    )
    return rows.length > 0
  }

  private async renumberChildren(manager: EntityManager, studyId: string, parentId: string | null): Promise<void> {
    const rows = await manager.find(Code, { where: { studyId, parentId: parentId ?? IsNull() }, order: { position: 'ASC', createdAt: 'ASC' }, select: { id: true } })
    await this.renumber(manager, rows.map((r) => r.id))
  }

  private async renumber(manager: EntityManager, ids: string[]): Promise<void> {
    if (!ids.length) return
    await manager.query(`UPDATE codes c SET position = o.ord - 1 FROM unnest($1::uuid[]) WITH ORDINALITY AS o(id, ord) WHERE c.id = o.id AND c.position <> o.ord - 1`, [ids])
  }
}
