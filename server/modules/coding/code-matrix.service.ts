import type { DataSource } from 'typeorm'
import type { CodeParticipantMatrix, CoOccurrenceMatrix } from '../../../shared/schemas/coding.js'
import { toCsv } from '../../lib/csv.js'
import type { CodingScope } from './coding-scope.js'

interface MatrixCodeRow {
  id: string
  label: string
  colour: string
  parent_id: string | null
}

/**
 * Code matrices computed in SQL: excerpts per code and participant, and code co-occurrence (two codes
 * on the same passage, or on overlapping passages of one coder in one transcript). Excerpts of
 * participants whose data may not be used never count; how many were left out is reported.
 */
export class CodeMatrixService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly scope: CodingScope,
  ) {}

  private codes(studyId: string): Promise<MatrixCodeRow[]> {
    return this.dataSource.query(`SELECT id, label, colour, parent_id FROM codes WHERE study_id = $1 AND status <> 'merged' ORDER BY position, created_at`, [studyId])
  }

  private async excluded(studyId: string, usable: string[], coderId?: string): Promise<number> {
    const [row]: { n: number }[] = await this.dataSource.query(
      `SELECT count(*)::int AS n FROM excerpts e WHERE e.study_id = $1 AND NOT (e.participant_id = ANY($2::uuid[])) AND ($3::uuid IS NULL OR e.coder_id = $3)`,
      [studyId, usable, coderId ?? null],
    )
    return row?.n ?? 0
  }

  async codeByParticipant(studyId: string, coderId?: string): Promise<CodeParticipantMatrix> {
    const usable = await this.scope.usableParticipants(studyId)
    const [codes, participants, cells, excluded] = await Promise.all([
      this.codes(studyId),
      this.dataSource.query(`SELECT id, pseudonym FROM participants WHERE id = ANY($1::uuid[]) ORDER BY pseudonym`, [usable]) as Promise<{ id: string; pseudonym: string }[]>,
      this.dataSource.query(
        `SELECT x.code_id, e.participant_id, count(DISTINCT e.id)::int AS n
           FROM excerpts e JOIN excerpt_codes x ON x.excerpt_id = e.id
          WHERE e.study_id = $1 AND e.participant_id = ANY($2::uuid[]) AND ($3::uuid IS NULL OR e.coder_id = $3)
          GROUP BY x.code_id, e.participant_id`,
        [studyId, usable, coderId ?? null],
      ) as Promise<{ code_id: string; participant_id: string; n: number }[]>,
      this.excluded(studyId, usable, coderId),
    ])
    return {
      codes: codes.map(codeOf),
      participants,
      cells: cells.map((c) => ({ codeId: c.code_id, participantId: c.participant_id, count: c.n })),
      excluded,
    }
  }

  async coOccurrence(studyId: string, coderId?: string): Promise<CoOccurrenceMatrix> {
    const usable = await this.scope.usableParticipants(studyId)
    const [codes, cells, excluded] = await Promise.all([
      this.codes(studyId),
      this.dataSource.query(
        `WITH coded AS (
           SELECT e.id, e.transcript_id, e.coder_id, e.start_offset AS s, e.end_offset AS t, x.code_id
             FROM excerpts e JOIN excerpt_codes x ON x.excerpt_id = e.id
            WHERE e.study_id = $1 AND e.participant_id = ANY($2::uuid[]) AND ($3::uuid IS NULL OR e.coder_id = $3))
         SELECT a.code_id AS a, b.code_id AS b, count(*)::int AS n
           FROM coded a JOIN coded b
             ON a.transcript_id = b.transcript_id AND a.coder_id = b.coder_id AND a.s < b.t AND b.s < a.t
            AND (a.code_id < b.code_id OR (a.code_id = b.code_id AND a.id = b.id))
          GROUP BY a.code_id, b.code_id`,
        [studyId, usable, coderId ?? null],
      ) as Promise<{ a: string; b: string; n: number }[]>,
      this.excluded(studyId, usable, coderId),
    ])
    return { codes: codes.map(codeOf), cells: cells.map((c) => ({ a: c.a, b: c.b, count: c.n })), excluded }
  }

  async codeByParticipantCsv(studyId: string, coderId: string | undefined, bom: boolean): Promise<string> {
    const m = await this.codeByParticipant(studyId, coderId)
    const count = new Map(m.cells.map((c) => [`${c.codeId}|${c.participantId}`, c.count]))
    return toCsv(['code', ...m.participants.map((p) => p.pseudonym), 'total'], m.codes.map((code) => {
      const row = m.participants.map((p) => count.get(`${code.id}|${p.id}`) ?? 0)
      return [code.label, ...row, row.reduce((a, b) => a + b, 0)]
    }), { bom })
  }

  async coOccurrenceCsv(studyId: string, coderId: string | undefined, bom: boolean): Promise<string> {
    const m = await this.coOccurrence(studyId, coderId)
    const count = new Map<string, number>()
    for (const c of m.cells) {
      count.set(`${c.a}|${c.b}`, c.count)
      count.set(`${c.b}|${c.a}`, c.count)
    }
    return toCsv(['code', ...m.codes.map((c) => c.label)], m.codes.map((a) => [a.label, ...m.codes.map((b) => count.get(`${a.id}|${b.id}`) ?? 0)]), { bom })
  }
}

const codeOf = (c: MatrixCodeRow) => ({ id: c.id, label: c.label, colour: c.colour, parentId: c.parent_id })
