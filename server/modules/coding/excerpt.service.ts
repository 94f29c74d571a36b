import { In, type DataSource, type EntityManager } from 'typeorm'
import { checkRange } from '../../../shared/coding/offsets.js'
import type { StudyRole } from '../../../shared/permissions.js'
import type { CodeExcerpts, CodingSettings, Excerpt as ExcerptDto, ExcerptCreate, ExcerptList, ExcerptUpdate } from '../../../shared/schemas/coding.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import { Study } from '../studies/study.entity.js'
import type { TranscriptService } from '../transcripts/transcript.service.js'
import { User } from '../users/user.entity.js'
import type { Code } from './code.entity.js'
import type { CodingScope } from './coding-scope.js'
import { Excerpt, ExcerptCode } from './excerpt.entity.js'
import { staleError } from './versioned-update.js'

interface ExcerptRow {
  id: string
  transcript_id: string
  coder_id: string
  start_offset: number
  end_offset: number
  text: string
  version: number
  created_at: Date
  updated_at: Date
  code_ids: string[]
}

/**
 * Excerpts: one coder's codes on a passage of one approved transcript version. A coder sees and
 * changes only their own; another coder's coding is shown read-only when the study allows comparison
 * (the lead may always look). Ranges are checked against the approved text (UTF-16 offsets).
 */
export class ExcerptService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly transcripts: TranscriptService,
    private readonly scope: CodingScope,
    private readonly audit: AuditService,
  ) {}

  async settings(studyId: string): Promise<CodingSettings> {
    // one plain query: listing a transcript's excerpts asks on every request
    const [study]: { coder_comparison: boolean }[] = await this.dataSource.query('SELECT coder_comparison FROM studies WHERE id = $1', [studyId])
    if (!study) throw new NotFoundError('study')
    return { coderComparison: study.coder_comparison }
  }

  async setSettings(studyId: string, input: CodingSettings, actor: AuditActor): Promise<CodingSettings> {
    await this.dataSource.transaction(async (manager) => {
      await manager.update(Study, { id: studyId }, { coderComparison: input.coderComparison })
      await this.audit.record(actor, { action: 'coding.settings_changed', studyId, targetType: 'study', targetId: studyId, details: { coderComparison: input.coderComparison } }, manager)
    })
    return this.settings(studyId)
  }

  /** Whether the caller may see another coder's coding: the lead always, coders when the study allows comparison. */
  async comparisonAllowed(studyId: string, role: StudyRole | null): Promise<boolean> {
    return role === 'lead' || (await this.settings(studyId)).coderComparison
  }

  async assertMayView(studyId: string, me: Express.User, role: StudyRole | null, coderId: string | undefined): Promise<boolean> {
    const allowed = await this.comparisonAllowed(studyId, role)
    if (coderId && coderId !== me.id && !allowed) throw new ForbiddenError('This study keeps each coder’s coding to themselves. The lead can switch on comparison between coders.')
    return allowed
  }

  async list(studyId: string, transcriptId: string, me: Express.User, role: StudyRole | null, coderId?: string): Promise<ExcerptList> {
    await this.transcripts.codableText(studyId, transcriptId)
    const comparisonAllowed = await this.assertMayView(studyId, me, role, coderId)
    const whose = coderId ?? me.id
    const coders: { id: string; name: string; n: number }[] = await this.dataSource.query(
      `SELECT u.id, u.name, count(e.id)::int AS n FROM excerpts e JOIN users u ON u.id = e.coder_id
        WHERE e.transcript_id = $1 AND e.study_id = $2 ${comparisonAllowed ? '' : 'AND e.coder_id = $3'} GROUP BY u.id, u.name ORDER BY u.name`,
      comparisonAllowed ? [transcriptId, studyId] : [transcriptId, studyId, me.id],
    )
    // one query for the whole list (a long transcript may carry thousands of excerpts)
    const rows: { id: string; coder_id: string; coder_name: string; start_offset: number; end_offset: number; text: string; code_ids: string[] | null; version: number; created_at: Date; updated_at: Date }[] =
      await this.dataSource.query(
        `SELECT e.id, e.coder_id, u.name AS coder_name, e.start_offset, e.end_offset, e.text, e.version, e.created_at, e.updated_at,
                (SELECT array_agg(x.code_id ORDER BY x.code_id) FROM excerpt_codes x WHERE x.excerpt_id = e.id) AS code_ids
           FROM excerpts e JOIN users u ON u.id = e.coder_id
          WHERE e.study_id = $1 AND e.transcript_id = $2 AND e.coder_id = $3
          ORDER BY e.start_offset, e.end_offset, e.created_at`,
        [studyId, transcriptId, whose],
      )
    const excerpts = rows.map((r) => ({
      id: r.id,
      transcriptId,
      coderId: r.coder_id,
      coderName: r.coder_name,
      start: r.start_offset,
      end: r.end_offset,
      text: r.text,
      codeIds: r.code_ids ?? [],
      version: r.version,
      createdAt: new Date(r.created_at).toISOString(),
      updatedAt: new Date(r.updated_at).toISOString(),
    }))
    return { excerpts, coders: coders.map((c) => ({ id: c.id, name: c.name, excerptCount: c.n })), comparisonAllowed }
  }

  /** Every excerpt carrying one code, across the study (for splitting a code, choosing its example). */
  async listForCode(studyId: string, codeId: string): Promise<CodeExcerpts> {
    const usable = await this.scope.usableParticipants(studyId)
    const found: { id: string; pseudonym: string }[] = await this.dataSource.query(
      `SELECT e.id, p.pseudonym FROM excerpts e JOIN excerpt_codes ec ON ec.excerpt_id = e.id AND ec.code_id = $2
         JOIN participants p ON p.id = e.participant_id
        WHERE e.study_id = $1 AND e.participant_id = ANY($3::uuid[]) ORDER BY e.created_at LIMIT 5000`,
      [studyId, codeId, usable],
    )
    const byId = new Map((await this.dataSource.getRepository(Excerpt).findBy({ id: In(found.map((f) => f.id)) })).map((e) => [e.id, e]))
    const rows = found.filter((f) => byId.has(f.id)).map((f) => Object.assign(byId.get(f.id)!, { pseudonym: f.pseudonym }))
    const dtos = await this.dtos(this.dataSource.manager, rows)
    return { excerpts: dtos.map((d, i) => ({ ...d, pseudonym: rows[i]!.pseudonym })) }
  }

  async create(studyId: string, transcriptId: string, input: ExcerptCreate, me: Express.User): Promise<ExcerptDto> {
    const { participantId, text } = await this.transcripts.codableText(studyId, transcriptId)
    this.checkRange(text, input.start, input.end, input.text)
    const quote = text.slice(input.start, input.end)
    // one statement: the excerpt and its codes are written only when every code is this study's and active
    const saved: { id: string; created_at: Date; updated_at: Date; version: number }[] = await this.dataSource.query(
      `WITH usable AS (SELECT count(*) AS n FROM codes WHERE id = ANY($5::uuid[]) AND study_id = $1 AND status = 'active'),
            ins AS (INSERT INTO excerpts (study_id, transcript_id, participant_id, coder_id, start_offset, end_offset, text)
                    SELECT $1, $2, $3, $4, $6, $7, $8 FROM usable WHERE usable.n = cardinality($5::uuid[])
                    RETURNING id, created_at, updated_at, version),
            links AS (INSERT INTO excerpt_codes (excerpt_id, code_id) SELECT ins.id, c FROM ins, unnest($5::uuid[]) AS c)
       SELECT * FROM ins`,
      [studyId, transcriptId, participantId, me.id, input.codeIds, input.start, input.end, quote],
    )
    if (!saved.length) {
      await this.checkCodes(this.dataSource.manager, studyId, input.codeIds)
      throw new ConflictError('A code changed while you were applying it. Reload the codebook and try again.')
    }
    const [e] = saved
    return {
      id: e!.id,
      transcriptId,
      coderId: me.id,
      coderName: me.name,
      start: input.start,
      end: input.end,
      text: quote,
      codeIds: input.codeIds,
      version: e!.version,
      createdAt: new Date(e!.created_at).toISOString(),
      updatedAt: new Date(e!.updated_at).toISOString(),
    }
  }

  async update(studyId: string, excerptId: string, input: ExcerptUpdate, me: Express.User): Promise<ExcerptDto> {
    const current = await this.own(studyId, excerptId, me)
    const { text } = await this.transcripts.codableText(studyId, current.transcriptId)
    let range: { start: number; end: number; text: string } | null = null
    if (input.start !== undefined || input.end !== undefined) {
      const start = input.start ?? current.start
      const end = input.end ?? current.end
      this.checkRange(text, start, end, input.text ?? text.slice(start, end))
      range = { start, end, text: text.slice(start, end) }
    }
    // the version check and the change in one statement, returning the row and (in the same snapshot)
    // its codes; a change of codes follows in the same transaction
    const versioned = `WITH saved AS (
        UPDATE excerpts SET ${range ? 'start_offset = $4, end_offset = $5, text = $6, ' : ''}version = version + 1, updated_at = CURRENT_TIMESTAMP
         WHERE id = $1 AND study_id = $2 AND version = $3
        RETURNING id, transcript_id, coder_id, start_offset, end_offset, text, version, created_at, updated_at)
      SELECT saved.*, ARRAY(SELECT code_id FROM excerpt_codes WHERE excerpt_id = $1) AS code_ids FROM saved`
    const params = [excerptId, studyId, input.version, ...(range ? [range.start, range.end, range.text] : [])]
    const apply = async (manager: EntityManager): Promise<ExcerptDto> => {
      const [saved]: ExcerptRow[] = await manager.query(versioned, params)
      if (!saved) await this.stale(manager, studyId, excerptId, input.version)
      let codeIds = saved!.code_ids
      if (input.codeIds) {
        // read again after the row lock, as another change of this excerpt's codes may have committed meanwhile
        const kept = ((await manager.query('SELECT code_id FROM excerpt_codes WHERE excerpt_id = $1', [excerptId])) as { code_id: string }[]).map((l) => l.code_id)
        codeIds = kept
        const added = input.codeIds.filter((id) => !kept.includes(id))
        await this.checkCodes(manager, studyId, added)
        const removed = kept.filter((id) => !input.codeIds!.includes(id))
        if (removed.length || added.length) {
          await manager.query(
            `WITH gone AS (DELETE FROM excerpt_codes WHERE excerpt_id = $1 AND code_id = ANY($2::uuid[]))
             INSERT INTO excerpt_codes (excerpt_id, code_id) SELECT $1, unnest($3::uuid[])`,
            [excerptId, removed, added],
          )
          codeIds = ((await manager.query('SELECT code_id FROM excerpt_codes WHERE excerpt_id = $1', [excerptId])) as { code_id: string }[]).map((l) => l.code_id)
        }
      }
      return {
        id: saved!.id,
        transcriptId: saved!.transcript_id,
        coderId: saved!.coder_id,
        coderName: me.name,
        start: saved!.start_offset,
        end: saved!.end_offset,
        text: saved!.text,
        codeIds,
        version: saved!.version,
        createdAt: new Date(saved!.created_at).toISOString(),
        updatedAt: new Date(saved!.updated_at).toISOString(),
      }
    }
    return input.codeIds ? this.dataSource.transaction(apply) : apply(this.dataSource.manager)
  }

  async remove(studyId: string, excerptId: string, version: number, me: Express.User): Promise<void> {
    await this.own(studyId, excerptId, me)
    // the version check, clearing it as a code's example, and the delete in one statement: a stale
    // page cannot remove what someone just changed
    const [gone]: { n: number }[] = await this.dataSource.query(
      `WITH gone AS (DELETE FROM excerpts WHERE id = $1 AND study_id = $2 AND version = $3 RETURNING id),
            unexample AS (UPDATE codes SET example_excerpt_id = NULL WHERE example_excerpt_id = $1 AND EXISTS (SELECT 1 FROM gone))
       SELECT count(*)::int AS n FROM gone`,
      [excerptId, studyId, version],
    )
    if (!gone!.n) await this.stale(this.dataSource.manager, studyId, excerptId, version)
  }

  /** Nothing changed: the excerpt is gone (404) or someone changed it first (409, with both versions). */
  private async stale(manager: EntityManager, studyId: string, excerptId: string, sent: number): Promise<never> {
    const [row]: { version: number }[] = await manager.query('SELECT version FROM excerpts WHERE id = $1 AND study_id = $2', [excerptId, studyId])
    if (!row) throw new NotFoundError('excerpt')
    throw staleError('excerpt', sent, row.version)
  }

  private async own(studyId: string, excerptId: string, me: Express.User): Promise<{ transcriptId: string; start: number; end: number }> {
    const [row]: { coder_id: string; transcript_id: string; start_offset: number; end_offset: number }[] = await this.dataSource.query(
      'SELECT coder_id, transcript_id, start_offset, end_offset FROM excerpts WHERE id = $1 AND study_id = $2',
      [excerptId, studyId],
    )
    if (!row) throw new NotFoundError('excerpt')
    if (row.coder_id !== me.id) throw new ForbiddenError('Each coder changes only their own excerpts. Add your own excerpt instead.')
    return { transcriptId: row.transcript_id, start: row.start_offset, end: row.end_offset }
  }

  private checkRange(text: string, start: number, end: number, quote: string): void {
    const problem = checkRange(text, start, end, quote)
    if (problem) throw new UnprocessableError(problem.message, [{ path: problem.field, message: problem.message }])
  }

  /** Codes must be this study's, and active: retired and merged codes take no new excerpts. */
  private async checkCodes(manager: EntityManager, studyId: string, codeIds: string[]): Promise<void> {
    if (!codeIds.length) return
    const codes: { id: string; label: string; status: Code['status'] }[] = await manager.query('SELECT id, label, status FROM codes WHERE id = ANY($1::uuid[]) AND study_id = $2', [codeIds, studyId])
    if (codes.length !== codeIds.length) throw new UnprocessableError('One of the codes is not in this study’s codebook. Reload the codebook and choose again.', [{ path: 'codeIds', message: 'Choose codes from this codebook.' }])
    const closed = codes.find((c) => c.status !== 'active')
    if (closed) throw new UnprocessableError(`“${closed.label}” is ${closed.status === 'retired' ? 'retired' : 'merged into another code'} and takes no new excerpts. Choose an active code.`, [{ path: 'codeIds', message: 'Choose active codes.' }])
  }

  private async dtos(manager: EntityManager, rows: Excerpt[], knownName?: string): Promise<ExcerptDto[]> {
    if (!rows.length) return []
    const ids = rows.map((r) => r.id)
    const [links, coders] = await Promise.all([
      manager.find(ExcerptCode, { where: { excerptId: In(ids) } }),
      knownName ? Promise.resolve([]) : manager.find(User, { where: { id: In([...new Set(rows.map((r) => r.coderId))]) }, select: { id: true, name: true } }),
    ])
    const nameOf = new Map(coders.map((c) => [c.id, c.name]))
    const codesOf = new Map<string, string[]>()
    for (const link of links) codesOf.set(link.excerptId, [...(codesOf.get(link.excerptId) ?? []), link.codeId])
    return rows.map((r) => ({
      id: r.id,
      transcriptId: r.transcriptId,
      coderId: r.coderId,
      coderName: knownName ?? nameOf.get(r.coderId) ?? '',
      start: r.start,
      end: r.end,
      text: r.text,
      codeIds: codesOf.get(r.id) ?? [],
      version: r.version,
      createdAt: r.createdAt.toISOString(),
      updatedAt: r.updatedAt.toISOString(),
    }))
  }
}
