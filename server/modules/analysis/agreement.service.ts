import type { DataSource } from 'typeorm'
import { alphaBand, kappaBand } from '../../../shared/analysis/bands.js'
import type { AgreementOutcome } from '../../../shared/analysis/agreement.js'
import { studyAgreement, unitsOf, type CodedExcerpt, type Span } from '../../../shared/analysis/study-agreement.js'
import type { StudyRole } from '../../../shared/permissions.js'
import type { AgreementResponse, AnalysisSettings, Coefficient } from '../../../shared/schemas/analysis.js'
import { NotFoundError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { CodingScope } from '../coding/coding-scope.js'
import { Study } from '../studies/study.entity.js'
import type { TranscriptService } from '../transcripts/transcript.service.js'

function coefficient(outcome: AgreementOutcome, band: typeof kappaBand): Coefficient {
  return 'value' in outcome ? { value: outcome.value, band: band(outcome.value) } : { value: null, reason: outcome.message }
}

/**
 * Inter-coder agreement for a study, per code and overall, on the study's unit (speaker turns or
 * sentences). Only approved transcripts whose participant's data may be coded take part; a transcript
 * counts when two or more of the compared coders coded it.
 */
export class AgreementService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly transcripts: TranscriptService,
    private readonly scope: CodingScope,
    private readonly audit: AuditService,
  ) {}

  async settings(studyId: string): Promise<AnalysisSettings> {
    const study = await this.dataSource.getRepository(Study).findOne({ where: { id: studyId }, select: { id: true, agreementEnabled: true, agreementUnit: true } })
    if (!study) throw new NotFoundError('study')
    return { agreementEnabled: study.agreementEnabled, agreementUnit: study.agreementUnit }
  }

  async setSettings(studyId: string, input: AnalysisSettings, actor: AuditActor): Promise<AnalysisSettings> {
    await this.dataSource.transaction(async (manager) => {
      await manager.update(Study, { id: studyId }, { agreementEnabled: input.agreementEnabled, agreementUnit: input.agreementUnit })
      await this.audit.record(actor, { action: 'analysis.settings_changed', studyId, targetType: 'study', targetId: studyId, details: { ...input } }, manager)
    })
    return this.settings(studyId)
  }

  async agreement(studyId: string, role: StudyRole | null, wanted?: string[]): Promise<AgreementResponse> {
    const study = await this.dataSource.getRepository(Study).findOne({ where: { id: studyId }, select: { id: true, agreementEnabled: true, agreementUnit: true, coderComparison: true } })
    if (!study) throw new NotFoundError('study')
    const empty = (emptyReason: string, extra: Partial<AgreementResponse> = {}): AgreementResponse => ({
      enabled: study.agreementEnabled, unit: study.agreementUnit, coders: [], availableCoders: [], transcripts: [], units: 0, overall: null, perCode: [], disagreements: [], disagreementCount: 0, emptyReason, ...extra,
    })
    // the figures and the disagreements show other coders' coding: coders see them only when the study allows comparison
    if (role !== 'lead' && !study.coderComparison) return empty('Your lead has not switched on comparison between coders, so agreement is shown to the lead only.')
    if (!study.agreementEnabled) return empty('Agreement is switched off for this study, as is usual for reflexive thematic analysis. The lead can switch it on.')

    const usable = await this.scope.usableParticipants(studyId)
    const rows: { transcript_id: string; coder_id: string; start_offset: number; end_offset: number; code_ids: string[] }[] = await this.dataSource.query(
      `SELECT e.transcript_id, e.coder_id, e.start_offset, e.end_offset, array_agg(x.code_id) AS code_ids
         FROM excerpts e JOIN excerpt_codes x ON x.excerpt_id = e.id JOIN transcripts t ON t.id = e.transcript_id
        WHERE e.study_id = $1 AND e.participant_id = ANY($2::uuid[]) AND t.status = 'approved'
        GROUP BY e.id`,
      [studyId, usable],
    )
    const coderSets = new Map<string, Set<string>>()
    for (const r of rows) coderSets.set(r.transcript_id, (coderSets.get(r.transcript_id) ?? new Set()).add(r.coder_id))
    const shared = [...coderSets].filter(([, coders]) => coders.size >= 2)
    const availableIds = [...new Set(shared.flatMap(([, coders]) => [...coders]))]
    const names: { id: string; name: string }[] = availableIds.length ? await this.dataSource.query(`SELECT id, name FROM users WHERE id = ANY($1::uuid[]) ORDER BY name`, [availableIds]) : []
    const availableCoders = names.map((n) => ({ id: n.id, name: n.name }))
    if (!rows.length) return empty('Nothing has been coded yet: agreement needs two coders’ coding of the same transcripts.', { availableCoders })
    if (!shared.length) return empty('No transcript has been coded by two coders yet. Ask a second coder to code one of the transcripts the first coder has coded.', { availableCoders })
    const coderIds = (wanted?.length ? availableCoders.filter((c) => wanted.includes(c.id)) : availableCoders).map((c) => c.id)
    if (coderIds.length < 2) return empty('Choose at least two coders who coded the same transcripts.', { availableCoders })

    const transcriptIds = shared.filter(([, coders]) => coderIds.filter((c) => coders.has(c)).length >= 2).map(([id]) => id)
    const turns: { transcript_id: string; start_offset: number; end_offset: number }[] = await this.dataSource.query(
      `SELECT transcript_id, start_offset, end_offset FROM transcript_turns WHERE transcript_id = ANY($1::uuid[]) ORDER BY transcript_id, position`,
      [transcriptIds],
    )
    const units = new Map<string, Span[]>()
    const texts = new Map<string, string>()
    for (const id of transcriptIds) {
      const { text } = await this.transcripts.codableText(studyId, id)
      texts.set(id, text)
      units.set(id, unitsOf(text, turns.filter((t) => t.transcript_id === id).map((t) => ({ start: t.start_offset, end: t.end_offset })), study.agreementUnit))
    }
    const codes: { id: string; label: string; colour: string }[] = await this.dataSource.query(`SELECT id, label, colour FROM codes WHERE study_id = $1 AND status <> 'merged' ORDER BY position, created_at`, [studyId])
    const excerpts: CodedExcerpt[] = rows.map((r) => ({ transcriptId: r.transcript_id, coderId: r.coder_id, start: r.start_offset, end: r.end_offset, codeIds: r.code_ids }))
    const result = studyAgreement({ units, excerpts, coderIds, codeIds: codes.map((c) => c.id) })
    const pseudonyms: { id: string; pseudonym: string }[] = await this.dataSource.query(
      `SELECT t.id, p.pseudonym FROM transcripts t JOIN participants p ON p.id = t.participant_id WHERE t.id = ANY($1::uuid[])`,
      [transcriptIds],
    )
    const pseudonymOf = new Map(pseudonyms.map((p) => [p.id, p.pseudonym]))
    const kappaOf = (o: AgreementOutcome | null) => (o ? coefficient(o, kappaBand) : null)
    return {
      enabled: true,
      unit: study.agreementUnit,
      coders: availableCoders.filter((c) => coderIds.includes(c.id)),
      availableCoders,
      transcripts: result.transcripts.map((t) => ({ id: t.transcriptId, pseudonym: pseudonymOf.get(t.transcriptId) ?? '', units: t.units })),
      units: result.units,
      overall: { percentAgreement: result.overall.percentAgreement, kappa: kappaOf(result.overall.kappa), alpha: coefficient(result.overall.alpha, alphaBand) },
      perCode: result.perCode.map((r, i) => ({
        codeId: r.codeId,
        label: codes[i]!.label,
        colour: codes[i]!.colour,
        units: result.units,
        codedBy: coderIds.map((coderId, c) => ({ coderId, units: r.codedBy[c]! })),
        percentAgreement: r.percentAgreement,
        kappa: kappaOf(r.kappa),
        alpha: coefficient(r.alpha, alphaBand),
      })),
      disagreements: result.disagreements.map((d) => ({ ...d, pseudonym: pseudonymOf.get(d.transcriptId) ?? '', text: texts.get(d.transcriptId)!.slice(d.start, Math.min(d.end, d.start + 400)) })),
      disagreementCount: result.disagreementCount,
      emptyReason: null,
    }
  }
}
