import type { DataSource } from 'typeorm'
import type { StudyRole } from '../../../shared/permissions.js'
import type { SearchHit, SearchQuery, SearchResponse } from '../../../shared/schemas/coding.js'
import { Study } from '../studies/study.entity.js'
import type { CodingScope } from './coding-scope.js'

const LIMIT = 100
const START = '\uE000'
const STOP = '\uE001'
/**
 * ts_headline's parser takes `<…>` for an HTML tag and drops it from the snippet, so a transcript's
 * `<inaudible>` would vanish: the text goes in with `<` swapped for a private-use character (chr(57346))
 * and comes back with it restored.
 */
const ANGLE = '\uE002'
const HEADLINE_TEXT = `replace(f.text, '<', chr(57346))`
const HEADLINE = `StartSel="${START}", StopSel="${STOP}", MaxWords=40, MinWords=12, ShortWord=2, MaxFragments=2, FragmentDelimiter=" … "`

/** Turns ts_headline's marked text into plain text and [start, end) highlight offsets (rendered as text, never HTML). */
export function unmark(marked: string): { context: string; highlights: [number, number][] } {
  let context = ''
  const highlights: [number, number][] = []
  let open = -1
  for (const ch of marked) {
    if (ch === START) open = context.length
    else if (ch === STOP) {
      if (open >= 0) highlights.push([open, context.length])
      open = -1
    } else context += ch === ANGLE ? '<' : ch
  }
  return { context, highlights }
}

interface HitRow {
  kind: 'excerpt' | 'transcript'
  id: string | null
  transcript_id: string
  pseudonym: string
  start_offset: number
  end_offset: number
  speaker: string | null
  coder_name: string | null
  code_ids: string[] | null
  headline: string
  total: number
}

/**
 * Full-text search (PostgreSQL, English configuration, web-search syntax: "quoted phrases", or, -not)
 * across excerpts and the turns of approved transcripts, with filters. Coders see other coders'
 * excerpts only when the study allows comparison; withdrawn data is never searched.
 */
export class CodingSearchService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly scope: CodingScope,
  ) {}

  async search(studyId: string, query: SearchQuery, me: Express.User, role: StudyRole | null): Promise<SearchResponse> {
    const usable = await this.scope.usableParticipants(studyId)
    const study = await this.dataSource.getRepository(Study).findOne({ where: { id: studyId }, select: { id: true, coderComparison: true } })
    const ownOnly = role !== 'lead' && !study?.coderComparison
    const [key, ...rest] = (query.characteristic ?? '').split('=')
    const characteristic = query.characteristic ? { key: key!.trim(), value: rest.join('=').trim() } : null
    const scope = query.in ?? 'all'
    const excerptsOnly = Boolean(query.codeId || query.coderId)
    const hits: HitRow[] = []
    if (scope !== 'transcripts') hits.push(...(await this.excerpts(studyId, query, usable, ownOnly ? me.id : null, characteristic)))
    if (scope !== 'excerpts' && !excerptsOnly) hits.push(...(await this.turns(studyId, query, usable, characteristic)))
    const total = [...new Set(hits.map((h) => h.kind))].reduce((sum, kind) => sum + (hits.find((h) => h.kind === kind)?.total ?? 0), 0)
    return { hits: hits.map(toHit), total, truncated: total > hits.length }
  }

  private excerpts(studyId: string, q: SearchQuery, usable: string[], onlyCoder: string | null, characteristic: { key: string; value: string } | null): Promise<HitRow[]> {
    const params: unknown[] = [studyId, usable, q.q, HEADLINE]
    const where = [`e.study_id = $1`, `e.participant_id = ANY($2::uuid[])`, `to_tsvector('english', e.text) @@ websearch_to_tsquery('english', $3)`]
    if (onlyCoder) where.push(`e.coder_id = $${params.push(onlyCoder)}`)
    if (q.coderId) where.push(`e.coder_id = $${params.push(q.coderId)}`)
    if (q.transcriptId) where.push(`e.transcript_id = $${params.push(q.transcriptId)}`)
    if (q.codeId) where.push(`EXISTS (SELECT 1 FROM excerpt_codes x WHERE x.excerpt_id = e.id AND x.code_id = $${params.push(q.codeId)})`)
    if (characteristic) where.push(`p.characteristics ->> $${params.push(characteristic.key)} = $${params.push(characteristic.value)}`)
    return this.dataSource.query(
      `WITH found AS (
         SELECT e.id, e.transcript_id, e.start_offset, e.end_offset, e.text, e.coder_id, p.pseudonym, count(*) OVER () AS total,
                ts_rank(to_tsvector('english', e.text), websearch_to_tsquery('english', $3)) AS rank
           FROM excerpts e JOIN participants p ON p.id = e.participant_id
          WHERE ${where.join(' AND ')}
          ORDER BY rank DESC, e.created_at LIMIT ${LIMIT})
       SELECT 'excerpt' AS kind, f.id, f.transcript_id, f.pseudonym, f.start_offset, f.end_offset, NULL AS speaker, u.name AS coder_name,
              (SELECT array_agg(x.code_id) FROM excerpt_codes x WHERE x.excerpt_id = f.id) AS code_ids,
              ts_headline('english', ${HEADLINE_TEXT}, websearch_to_tsquery('english', $3), $4) AS headline, f.total::int AS total
         FROM found f JOIN users u ON u.id = f.coder_id ORDER BY f.rank DESC`,
      params,
    )
  }

  private turns(studyId: string, q: SearchQuery, usable: string[], characteristic: { key: string; value: string } | null): Promise<HitRow[]> {
    const params: unknown[] = [studyId, usable, q.q, HEADLINE]
    const where = [`t.study_id = $1`, `t.status = 'approved'`, `t.participant_id = ANY($2::uuid[])`, `to_tsvector('english', coalesce(tt.text, '')) @@ websearch_to_tsquery('english', $3)`]
    if (q.transcriptId) where.push(`t.id = $${params.push(q.transcriptId)}`)
    if (characteristic) where.push(`p.characteristics ->> $${params.push(characteristic.key)} = $${params.push(characteristic.value)}`)
    return this.dataSource.query(
      `WITH found AS (
         SELECT tt.transcript_id, tt.start_offset, tt.end_offset, tt.speaker, tt.text, p.pseudonym, tt.position, count(*) OVER () AS total,
                ts_rank(to_tsvector('english', coalesce(tt.text, '')), websearch_to_tsquery('english', $3)) AS rank
           FROM transcript_turns tt JOIN transcripts t ON t.id = tt.transcript_id JOIN participants p ON p.id = t.participant_id
          WHERE ${where.join(' AND ')}
          ORDER BY rank DESC, p.pseudonym, tt.position LIMIT ${LIMIT})
       SELECT 'transcript' AS kind, NULL AS id, f.transcript_id, f.pseudonym, f.start_offset, f.end_offset, f.speaker, NULL AS coder_name, NULL AS code_ids,
              ts_headline('english', ${HEADLINE_TEXT}, websearch_to_tsquery('english', $3), $4) AS headline, f.total::int AS total
         FROM found f ORDER BY f.rank DESC`,
      params,
    )
  }
}

function toHit(r: HitRow): SearchHit {
  const { context, highlights } = unmark(r.headline)
  return {
    kind: r.kind,
    transcriptId: r.transcript_id,
    pseudonym: r.pseudonym,
    start: r.start_offset,
    end: r.end_offset,
    speaker: r.speaker,
    context,
    highlights,
    excerptId: r.id,
    coderName: r.coder_name,
    codeIds: r.code_ids ?? [],
  }
}
