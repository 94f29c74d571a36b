import { IsNull, type DataSource, type EntityManager } from 'typeorm'
import { OKABE_ITO, type Code as CodeDto, type CodeCreate, type CodeUpdate } from '../../../shared/schemas/coding.js'
import { ConflictError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { Study } from '../studies/study.entity.js'
import { Code } from './code.entity.js'
import type { CodingScope } from './coding-scope.js'
import { updateWithVersion } from './versioned-update.js'

const UNIQUE_VIOLATION = '23505'

/** A duplicate label hits the case-insensitive unique index; say so in words. */
export function labelTaken(error: unknown, label: string): never {
  if ((error as { code?: string }).code === UNIQUE_VIOLATION) throw new ConflictError(`The codebook already has a code called “${label}”. Choose another label, or merge the two codes.`)
  throw error
}

/** Serialises changes to one study's codebook structure (positions, merges, imports). */
export async function lockCodebook(manager: EntityManager, studyId: string): Promise<void> {
  const study = await manager.findOne(Study, { where: { id: studyId }, lock: { mode: 'pessimistic_write' }, select: { id: true } })
  if (!study) throw new NotFoundError('study')
}

interface CodeRow {
  id: string
  parent_id: string | null
  position: number
  label: string
  definition: string
  when_to_use: string
  when_not_to_use: string
  example_excerpt_id: string | null
  colour: string
  status: Code['status']
  merged_into_id: string | null
  version: number
  updated_at: Date
  excerpt_count: number
  example_transcript_id: string | null
  example_text: string | null
  example_pseudonym: string | null
}

/** The codebook: reading it with counts and examples, adding and changing codes. */
export class CodeService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly scope: CodingScope,
  ) {}

  /**
   * The codebook in two round trips: whose data may be counted (the consent policy), then every code
   * with its excerpt count and its example in one plain statement (the codebook is read on every page
   * of coding).
   */
  async list(studyId: string): Promise<CodeDto[]> {
    const usable = await this.scope.usableParticipants(studyId)
    const rows: CodeRow[] = await this.dataSource.query(
      `SELECT c.id, c.parent_id, c.position, c.label, c.definition, c.when_to_use, c.when_not_to_use, c.example_excerpt_id, c.colour, c.status,
              c.merged_into_id, c.version, c.updated_at, coalesce(n.n, 0) AS excerpt_count,
              ex.transcript_id AS example_transcript_id, ex.text AS example_text, ex.pseudonym AS example_pseudonym
         FROM codes c
         LEFT JOIN (SELECT ec.code_id, count(*)::int AS n FROM excerpt_codes ec JOIN excerpts e ON e.id = ec.excerpt_id
                     WHERE e.study_id = $1 AND e.participant_id = ANY($2::uuid[]) GROUP BY ec.code_id) n ON n.code_id = c.id
         LEFT JOIN (SELECT e.id, e.transcript_id, e.text, p.pseudonym FROM excerpts e JOIN participants p ON p.id = e.participant_id
                     WHERE e.study_id = $1 AND e.participant_id = ANY($2::uuid[])) ex ON ex.id = c.example_excerpt_id
        WHERE c.study_id = $1
        ORDER BY c.position ASC, c.created_at ASC`,
      [studyId, usable],
    )
    return rows.map((r) => ({
      id: r.id,
      parentId: r.parent_id,
      position: r.position,
      label: r.label,
      definition: r.definition,
      whenToUse: r.when_to_use,
      whenNotToUse: r.when_not_to_use,
      exampleExcerptId: r.example_excerpt_id,
      example: r.example_excerpt_id && r.example_text !== null ? { transcriptId: r.example_transcript_id!, text: r.example_text.slice(0, 600), pseudonym: r.example_pseudonym! } : null,
      colour: r.colour,
      status: r.status,
      mergedIntoId: r.merged_into_id,
      version: r.version,
      excerptCount: r.excerpt_count,
      updatedAt: new Date(r.updated_at).toISOString(),
    }))
  }

  async one(studyId: string, codeId: string): Promise<CodeDto> {
    const code = (await this.list(studyId)).find((c) => c.id === codeId)
    if (!code) throw new NotFoundError('code')
    return code
  }

  async create(studyId: string, input: CodeCreate, actor: AuditActor): Promise<CodeDto> {
    const id = await this.dataSource.transaction(async (manager) => {
      await lockCodebook(manager, studyId)
      const parentId = input.parentId ?? null
      if (parentId) await this.usableParent(manager, studyId, parentId)
      const siblings = await manager.count(Code, { where: { studyId, parentId: parentId ?? IsNull() } })
      const total = await manager.count(Code, { where: { studyId } })
      const row = manager.create(Code, {
        studyId,
        parentId,
        position: siblings,
        label: input.label,
        definition: input.definition ?? '',
        whenToUse: input.whenToUse ?? '',
        whenNotToUse: input.whenNotToUse ?? '',
        colour: input.colour ?? OKABE_ITO[total % OKABE_ITO.length]!.hex,
        exampleExcerptId: null,
        status: 'active',
      })
      const saved = await manager.save(row).catch((error: unknown) => labelTaken(error, input.label))
      if (input.exampleExcerptId) await this.checkExample(manager, studyId, saved.id, input.exampleExcerptId)
      if (input.exampleExcerptId) await manager.update(Code, { id: saved.id }, { exampleExcerptId: input.exampleExcerptId })
      await this.audit.record(actor, { action: 'code.created', studyId, targetType: 'code', targetId: saved.id, details: { label: saved.label } }, manager)
      return saved.id
    })
    return this.one(studyId, id)
  }

  async update(studyId: string, codeId: string, input: CodeUpdate, actor: AuditActor): Promise<CodeDto> {
    await this.dataSource.transaction(async (manager) => {
      const code = await manager.findOneBy(Code, { id: codeId, studyId })
      if (!code) throw new NotFoundError('code')
      if (code.status === 'merged') throw new ConflictError('This code was merged into another one and can no longer change. Change the code it was merged into.')
      const { version, ...fields } = input
      const changes = Object.fromEntries(Object.entries(fields).filter(([key, value]) => value !== undefined && value !== (code as never)[key]))
      if (fields.exampleExcerptId) await this.checkExample(manager, studyId, codeId, fields.exampleExcerptId)
      await updateWithVersion(manager, Code, { id: codeId, studyId }, version, changes, 'code').catch((error: unknown) => labelTaken(error, fields.label ?? code.label))
      const action = changes.status === 'retired' ? 'code.retired' : changes.status === 'active' ? 'code.reactivated' : 'code.updated'
      await this.audit.record(actor, { action, studyId, targetType: 'code', targetId: codeId, details: { label: fields.label ?? code.label, changed: Object.keys(changes) } }, manager)
    })
    return this.one(studyId, codeId)
  }

  /** A parent must be a code of this study that is not merged away. */
  async usableParent(manager: EntityManager, studyId: string, parentId: string): Promise<Code> {
    const parent = await manager.findOneBy(Code, { id: parentId, studyId })
    if (!parent) throw new UnprocessableError('The parent code is not in this study’s codebook.', [{ path: 'parentId', message: 'Choose a code from this codebook.' }])
    if (parent.status === 'merged') throw new UnprocessableError('The parent code was merged into another one. Choose the code it was merged into.', [{ path: 'parentId', message: 'Choose an unmerged code.' }])
    return parent
  }

  /** An example must be an excerpt of this study that carries the code. */
  private async checkExample(manager: EntityManager, studyId: string, codeId: string, excerptId: string): Promise<void> {
    const found: unknown[] = await manager.query(
      `SELECT 1 FROM excerpts e JOIN excerpt_codes ec ON ec.excerpt_id = e.id WHERE e.id = $1 AND e.study_id = $2 AND ec.code_id = $3`,
      [excerptId, studyId, codeId],
    )
    if (!found.length) throw new UnprocessableError('The example must be an excerpt coded with this code.', [{ path: 'exampleExcerptId', message: 'Choose one of this code’s excerpts.' }])
  }
}
