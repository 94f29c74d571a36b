import type { DataSource } from 'typeorm'
import type { Memo as MemoDto, MemoCreate, MemoTarget, MemoUpdate } from '../../../shared/schemas/coding.js'
import { ForbiddenError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { CodingScope } from './coding-scope.js'
import { Memo } from './memo.entity.js'
import { updateWithVersion } from './versioned-update.js'

interface MemoRow {
  id: string
  target_type: MemoTarget
  target_id: string | null
  body: string
  author_id: string
  author_name: string
  version: number
  created_at: Date
  updated_at: Date
  code_label: string | null
  transcript_id: string | null
  pseudonym: string | null
}

/**
 * Memos on the study, a transcript, an excerpt or a code; searchable with PostgreSQL full-text search.
 * Memos on transcripts and excerpts of participants whose data may not be used are not shown.
 */
export class MemoService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly scope: CodingScope,
  ) {}

  async list(studyId: string, filter: { targetType?: MemoTarget; targetId?: string; q?: string; id?: string }): Promise<MemoDto[]> {
    const usable = await this.scope.usableParticipants(studyId)
    const params: unknown[] = [studyId, usable]
    const where = ['m.study_id = $1', `(coalesce(t.participant_id, te.participant_id) IS NULL OR coalesce(t.participant_id, te.participant_id) = ANY($2::uuid[]))`]
    if (filter.targetType) where.push(`m.target_type = $${params.push(filter.targetType)}`)
    if (filter.targetId) where.push(`m.target_id = $${params.push(filter.targetId)}`)
    if (filter.id) where.push(`m.id = $${params.push(filter.id)}`)
    if (filter.q) where.push(`to_tsvector('english', m.body) @@ websearch_to_tsquery('english', $${params.push(filter.q)})`)
    const rows: MemoRow[] = await this.dataSource.query(
      `SELECT m.id, m.target_type, m.target_id, m.body, m.author_id, u.name AS author_name, m.version, m.created_at, m.updated_at,
              c.label AS code_label, coalesce(t.id, te.id) AS transcript_id, p.pseudonym
         FROM memos m JOIN users u ON u.id = m.author_id
         LEFT JOIN codes c ON m.target_type = 'code' AND c.id = m.target_id
         LEFT JOIN transcripts t ON m.target_type = 'transcript' AND t.id = m.target_id
         LEFT JOIN excerpts e ON m.target_type = 'excerpt' AND e.id = m.target_id
         LEFT JOIN transcripts te ON te.id = e.transcript_id
         LEFT JOIN participants p ON p.id = coalesce(t.participant_id, te.participant_id)
        WHERE ${where.join(' AND ')}
        ORDER BY m.created_at DESC LIMIT 500`,
      params,
    )
    return rows.map(toDto)
  }

  async create(studyId: string, input: MemoCreate & { targetId: string | null }, me: Express.User): Promise<MemoDto> {
    await this.checkTarget(studyId, input.targetType, input.targetId)
    const saved = await this.dataSource.getRepository(Memo).save({ studyId, targetType: input.targetType, targetId: input.targetId, body: input.body, authorId: me.id })
    return this.one(studyId, saved.id)
  }

  async update(studyId: string, memoId: string, input: MemoUpdate, me: Express.User): Promise<MemoDto> {
    await this.own(studyId, memoId, me)
    await updateWithVersion(this.dataSource.manager, Memo, { id: memoId, studyId }, input.version, { body: input.body }, 'memo')
    return this.one(studyId, memoId)
  }

  async remove(studyId: string, memoId: string, me: Express.User): Promise<void> {
    await this.own(studyId, memoId, me)
    await this.dataSource.getRepository(Memo).delete({ id: memoId, studyId })
  }

  private async one(studyId: string, memoId: string): Promise<MemoDto> {
    // by id, not by scanning the newest 500: an older memo must still be found after an edit
    const [memo] = await this.list(studyId, { id: memoId })
    if (!memo) throw new NotFoundError('memo')
    return memo
  }

  private async own(studyId: string, memoId: string, me: Express.User): Promise<Memo> {
    const memo = await this.dataSource.getRepository(Memo).findOneBy({ id: memoId, studyId })
    if (!memo) throw new NotFoundError('memo')
    if (memo.authorId !== me.id) throw new ForbiddenError('Only the author changes or removes a memo. Write your own memo to reply.')
    return memo
  }

  /** The memo's target must exist in this study (and be open to coding). */
  private async checkTarget(studyId: string, type: MemoTarget, targetId: string | null): Promise<void> {
    if (type === 'study') return
    const table = { transcript: 'transcripts', excerpt: 'excerpts', code: 'codes' }[type]
    const found: { participant_id?: string }[] = await this.dataSource.query(
      `SELECT ${type === 'code' ? 'NULL AS participant_id' : 'participant_id'} FROM ${table} WHERE id = $1 AND study_id = $2`,
      [targetId, studyId],
    )
    const participantId = found[0]?.participant_id
    if (!found.length || (participantId && !(await this.scope.mayCode(studyId, participantId))))
      throw new UnprocessableError(`The ${type} this memo is about is not in this study.`, [{ path: 'targetId', message: `Choose a ${type} of this study.` }])
  }
}

function toDto(r: MemoRow): MemoDto {
  const targetLabel =
    r.target_type === 'study' ? 'The study' : r.target_type === 'code' ? `Code: ${r.code_label ?? '(removed)'}` : `${r.target_type === 'excerpt' ? 'Excerpt' : 'Transcript'} of ${r.pseudonym ?? '(removed)'}`
  return {
    id: r.id,
    targetType: r.target_type,
    targetId: r.target_id,
    targetLabel,
    transcriptId: r.transcript_id,
    body: r.body,
    authorId: r.author_id,
    authorName: r.author_name,
    version: r.version,
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
  }
}
