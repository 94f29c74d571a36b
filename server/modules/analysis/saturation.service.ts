import type { DataSource } from 'typeorm'
import { assessSaturation, methodsSentence } from '../../../shared/analysis/saturation.js'
import type { SaturationResponse } from '../../../shared/schemas/analysis.js'
import type { CodingScope } from '../coding/coding-scope.js'

export const SATURATION_CITATION = 'Guest, G., Namey, E. & Chen, M. (2020). A simple method to assess and report thematic saturation in qualitative research. PLOS ONE 15(5): e0232076.'

/**
 * New codes per interview, in interview order, and the stopping rule of Guest, Namey & Chen (2020).
 * An interview counts once it has coding; its codes are every code applied to its approved
 * transcript (by one coder, when asked). Withdrawn data never counts.
 */
export class SaturationService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly scope: CodingScope,
  ) {}

  async assess(studyId: string, params: { baseSize: number; runLength: number; threshold: number }, coderId?: string): Promise<SaturationResponse> {
    const usable = await this.scope.usableParticipants(studyId)
    const rows: { transcript_id: string; pseudonym: string; scheduled_at: Date; code_ids: string[] }[] = await this.dataSource.query(
      `SELECT t.id AS transcript_id, p.pseudonym, i.scheduled_at, array_agg(DISTINCT x.code_id) AS code_ids
         FROM transcripts t
         JOIN interviews i ON i.id = t.interview_id
         JOIN participants p ON p.id = t.participant_id
         JOIN excerpts e ON e.transcript_id = t.id AND ($3::uuid IS NULL OR e.coder_id = $3)
         JOIN excerpt_codes x ON x.excerpt_id = e.id
         JOIN codes c ON c.id = x.code_id AND c.status <> 'merged'
        WHERE t.study_id = $1 AND t.status = 'approved' AND t.participant_id = ANY($2::uuid[])
        GROUP BY t.id, p.pseudonym, i.scheduled_at
        ORDER BY i.scheduled_at, p.pseudonym`,
      [studyId, usable, coderId ?? null],
    )
    const result = assessSaturation(rows.map((r) => r.code_ids), params)
    return {
      params: result.params,
      interviews: rows.map((r, i) => ({
        transcriptId: r.transcript_id,
        pseudonym: r.pseudonym,
        interviewDate: new Date(r.scheduled_at).toISOString(),
        codes: r.code_ids.length,
        newCodes: result.newPerInterview[i] ?? 0,
        cumulative: result.cumulative[i] ?? 0,
      })),
      status: result.status,
      reached: result.reached,
      saturationAt: result.saturationAt,
      label: result.label,
      baseCodes: result.baseCodes,
      steps: result.steps.map((s) => ({ from: s.from, to: s.to, newCodes: s.newCodes, ratio: s.ratio, meetsThreshold: s.meetsThreshold })),
      reason: result.reason,
      methodsSentence: methodsSentence(result),
      citation: SATURATION_CITATION,
    }
  }
}
