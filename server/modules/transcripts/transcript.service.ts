import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { StudyRole } from '../../../shared/permissions.js'
import { applyRedactions, PlaceholderRegistry, scanForIdentifiers, type IdentifierCategory } from '../../../shared/deidentify/index.js'
import type { DeidentificationTerms, Flag, FlagDecisions, TranscriptReading, TranscriptReview, TranscriptSummary } from '../../../shared/schemas/interviews.js'
import { AppError, ConflictError, NotFoundError, UnavailableError, ValidationError } from '../../lib/errors.js'
import type { ObjectStore } from '../../storage/object-store.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { ConsentService } from '../consent/consent.service.js'
import { Interview } from '../interviews/interview.entity.js'
import { ParticipantContact } from '../recruitment/participant-contact.entity.js'
import { Participant } from '../recruitment/participant.entity.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'
import { AnonymisationLogEntry } from './anonymisation-log.entity.js'
import { remapOffset } from './offsets.js'
import { deidentifySpeaker } from './speaker-labels.js'
import { parseTranscript, TranscriptParseError, type ParsedTranscript } from './parsing/index.js'
import { acceptedSpans, applyDecisions, asCategory } from './transcript-flags.js'
import { TranscriptTurn } from './transcript-turn.entity.js'
import { Transcript } from './transcript.entity.js'

const STAFF: readonly StudyRole[] = ['lead', 'coordinator']

/** What a transcript summary shows: lists load only these columns (not the scanner's flags). */
type SummaryRow = Pick<Transcript, 'id' | 'interviewId' | 'participantId' | 'version' | 'status' | 'format' | 'wordCount' | 'createdAt'>

interface ApprovedRow { id: string; interview_id: string; participant_id: string; version: number; status: Transcript['status']; format: string; word_count: number; created_at: Date; object_key: string; sha256: string }
/** What reading a transcript adds to the approved row: the participant's pseudonym, the interview date, the turns in order. */
interface ReadingRow {
  pseudonym: string | null
  scheduled_at: Date | string | null
  turns: { speaker: string; start_ms: number | null; start_offset: number; end_offset: number }[]
}

function summaryOf(t: SummaryRow, found: { pseudonym: string | null; scheduled_at: Date | string | null } | undefined): TranscriptSummary {
  return {
    id: t.id,
    interviewId: t.interviewId,
    participantId: t.participantId,
    pseudonym: found?.pseudonym ?? '',
    interviewDate: found?.scheduled_at ? new Date(found.scheduled_at).toISOString() : '',
    version: t.version,
    status: t.status,
    format: t.format,
    wordCount: t.wordCount,
    createdAt: t.createdAt.toISOString(),
  }
}

function storageFailure(error: unknown): boolean {
  const e = error as { name?: string; code?: string; $metadata?: unknown }
  return Boolean(e?.$metadata) || ['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE'].includes(e?.code ?? '') || e?.name === 'TimeoutError'
}

/**
 * Transcripts: upload to quarantine, assisted scan, a person's review, and approval, after which only
 * the de-identified text is kept (object store, with its SHA-256) and the quarantine is deleted.
 */
export class TranscriptService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly storage: ObjectStore,
    private readonly audit: AuditService,
    private readonly consent: ConsentService,
  ) {}

  /** approved texts by SHA-256, oldest first (a small first-in, first-out cache) */
  private readonly approvedTexts = new Map<string, string>()

  private async summaries(rows: SummaryRow[]): Promise<TranscriptSummary[]> {
    if (!rows.length) return []
    // one round trip for each transcript's pseudonym and interview date (reading and listing transcripts ask on every request)
    const found: { pseudonym: string | null; scheduled_at: Date | null }[] = await this.dataSource.query(
      `SELECT p.pseudonym, i.scheduled_at
         FROM unnest($1::uuid[], $2::uuid[]) WITH ORDINALITY AS x(interview_id, participant_id, n)
         LEFT JOIN interviews i ON i.id = x.interview_id LEFT JOIN participants p ON p.id = x.participant_id
        ORDER BY x.n`,
      [rows.map((r) => r.interviewId), rows.map((r) => r.participantId)],
    )
    return rows.map((t, n) => summaryOf(t, found[n]))
  }

  /** Lead and coordinators see every version in any state; coders only approved ones they may code. */
  async list(studyId: string, role: StudyRole | null): Promise<TranscriptSummary[]> {
    const staff = role !== null && STAFF.includes(role)
    // one plain statement for the list with each pseudonym and interview date, beside (for coders) the
    // data use of every participant it can hold: the transcript list is read on every visit
    const [rows, uses] = await Promise.all([
      this.dataSource.query(
        `SELECT t.id, t.interview_id, t.participant_id, t.version, t.status, t.format, t.word_count, t.created_at, p.pseudonym, i.scheduled_at
           FROM transcripts t LEFT JOIN interviews i ON i.id = t.interview_id LEFT JOIN participants p ON p.id = t.participant_id
          WHERE t.study_id = $1 ${staff ? '' : `AND t.status = 'approved'`}
          ORDER BY t.created_at ASC`,
        [studyId],
      ) as Promise<(Omit<ApprovedRow, 'object_key' | 'sha256'> & { pseudonym: string | null; scheduled_at: Date | null })[]>,
      staff ? null : this.consent.dataUseOfTranscribed(studyId, { withPurged: true }),
    ])
    return rows
      .filter((r) => !uses || uses.get(r.participant_id)?.mayCode)
      .map((r) =>
        summaryOf(
          { id: r.id, interviewId: r.interview_id, participantId: r.participant_id, version: r.version, status: r.status, format: r.format, wordCount: r.word_count, createdAt: new Date(r.created_at) },
          r,
        ),
      )
  }

  async upload(studyId: string, interviewId: string, buffer: Buffer, actor: AuditActor): Promise<TranscriptSummary> {
    const interview = await this.dataSource.getRepository(Interview).findOneBy({ id: interviewId, studyId })
    if (!interview) throw new NotFoundError('interview')
    if (interview.notesOnly) throw new ConflictError('The participant declined audio recording, so this interview keeps field notes only and takes no transcript.')
    if (interview.status !== 'done') throw new ConflictError('Mark the interview as done before uploading its transcript.')
    const use = (await this.consent.view(studyId, interview.participantId)).dataUse
    if (!use.mayCode) throw new ConflictError('This participant’s consent does not allow their interview to be used (no valid consent, or data withdrawn).')
    let parsed: ParsedTranscript
    try {
      parsed = await parseTranscript(buffer)
    } catch (error) {
      if (error instanceof TranscriptParseError) throw new ValidationError(error.message, [{ path: 'file', message: error.message }])
      throw error
    }
    const contact = await this.dataSource.getRepository(ParticipantContact).findOneBy({ participantId: interview.participantId })
    const study = await this.dataSource.getRepository(Study).findOneByOrFail({ id: studyId })
    const studyTerms = [
      ...(contact?.name ? [contact.name, ...contact.name.split(/\s+/).filter((part) => part.length > 2)].map((term) => ({ term, category: 'name' as const })) : []),
      ...Object.entries(study.placeholderRegistry).map(([term, v]) => ({ term, category: v.category as IdentifierCategory })),
      ...study.deidentificationTerms.map((t) => ({ term: t.term, category: t.category as IdentifierCategory })),
    ]
    const flags: Flag[] = scanForIdentifiers(parsed.text, { studyTerms }).map((f) => ({ id: randomUUID(), ...f, source: 'scanner' as const, decision: 'pending' as const }))
    const id = randomUUID()
    const prefix = `quarantine/studies/${studyId}/transcripts/${id}`
    try {
      await this.storage.put(`${prefix}/upload`, buffer, 'application/octet-stream')
      await this.storage.put(`${prefix}/parsed.json`, Buffer.from(JSON.stringify(parsed)), 'application/json')
    } catch (error) {
      await this.removeQuarantine(prefix)
      if (storageFailure(error)) throw new UnavailableError('File storage')
      throw error
    }
    try {
      const saved = await this.dataSource.transaction(async (manager) => {
        const [{ next }] = await manager.query(`SELECT coalesce(max(version), 0) + 1 AS next FROM transcripts WHERE interview_id = $1`, [interviewId])
        const row = await manager.save(
          manager.create(Transcript, { id, studyId, interviewId, participantId: interview.participantId, version: next, status: 'in_review', format: parsed.format, wordCount: parsed.wordCount, quarantinePrefix: prefix, flags, uploadedById: actor.id }),
        )
        await this.audit.record(actor, { action: 'transcript.uploaded', studyId, targetType: 'transcript', targetId: id, details: { version: next, format: parsed.format, flags: flags.length } }, manager)
        return row
      })
      return (await this.summaries([saved]))[0]!
    } catch (error) {
      await this.removeQuarantine(prefix)
      throw error
    }
  }

  private async removeQuarantine(prefix: string | null) {
    if (!prefix) return
    await Promise.all([this.storage.delete(`${prefix}/upload`).catch(() => {}), this.storage.delete(`${prefix}/parsed.json`).catch(() => {})])
  }

  private async inReview(studyId: string, transcriptId: string): Promise<{ row: Transcript; parsed: ParsedTranscript }> {
    const row = await this.dataSource.getRepository(Transcript).findOneBy({ id: transcriptId, studyId })
    if (!row) throw new NotFoundError('transcript')
    if (row.status !== 'in_review') throw new ConflictError(`This transcript is ${row.status.replace('_', ' ')}; its review is closed.`)
    let raw: Buffer
    try {
      raw = await this.storage.get(`${row.quarantinePrefix}/parsed.json`)
    } catch (error) {
      if (storageFailure(error)) throw new UnavailableError('File storage')
      throw error
    }
    return { row, parsed: JSON.parse(raw.toString('utf8')) as ParsedTranscript }
  }

  async review(studyId: string, transcriptId: string): Promise<TranscriptReview> {
    const { row, parsed } = await this.inReview(studyId, transcriptId)
    const [summary] = await this.summaries([row])
    return { ...summary!, text: parsed.text, turns: parsed.turns.map((t) => ({ speaker: t.speaker, startMs: t.startMs, start: t.start, end: t.end })), flags: row.flags }
  }

  async decide(studyId: string, transcriptId: string, input: FlagDecisions, actor: AuditActor): Promise<TranscriptReview> {
    const { row, parsed } = await this.inReview(studyId, transcriptId)
    const flags = applyDecisions(parsed.text, row.flags, input)
    await this.dataSource.getRepository(Transcript).update({ id: row.id }, { flags: flags as never })
    await this.audit.record(actor, { action: 'transcript.flags_reviewed', studyId, targetType: 'transcript', targetId: row.id, details: { decisions: input.decisions.length, everywhere: input.acceptEverywhere.length, manual: input.manual.length } })
    return this.review(studyId, transcriptId)
  }

  /**
   * Replaces every accepted flag with the study's consistent placeholder, stores the de-identified
   * text and its turns, logs each replacement, and deletes the quarantine. If the object store is down
   * the transaction rolls back and nothing is half-saved.
   */
  async approve(studyId: string, transcriptId: string, actor: AuditActor): Promise<TranscriptSummary> {
    const { row, parsed } = await this.inReview(studyId, transcriptId)
    const pending = row.flags.filter((f) => f.decision === 'pending').length
    if (pending) throw new ConflictError(`${pending} flag${pending === 1 ? '' : 's'} still need${pending === 1 ? 's' : ''} a decision. Accept or reject each one, then approve.`)
    const objectKey = `studies/${studyId}/transcripts/${row.id}/v${row.version}.txt`
    try {
      await this.dataSource.transaction(async (manager) => {
        const study = await manager.findOne(Study, { where: { id: studyId }, lock: { mode: 'pessimistic_write' } })
        const registry = new PlaceholderRegistry(study!.placeholderRegistry as never)
        const spans = acceptedSpans(parsed.text, row.flags)
        const { text, log } = applyRedactions(parsed.text, spans, registry)
        const edits = log.map((l) => ({ start: l.start, end: l.end, replacementLength: l.placeholder.length }))
        const by = actor.id ? ((await manager.findOneBy(User, { id: actor.id }))?.name ?? null) : null
        const participant = await manager.findOneByOrFail(Participant, { id: row.participantId })
        const contact = await manager.findOneBy(ParticipantContact, { participantId: row.participantId })
        const speakerContext = {
          pseudonym: participant.pseudonym,
          nameParts: (contact?.name ?? '').toLowerCase().split(/\s+/).filter((part) => part.length > 2),
          replacements: log.map((l) => ({ term: l.original, placeholder: l.placeholder })),
        }
        await manager.insert(
          TranscriptTurn,
          parsed.turns.map((t, position) => ({
            transcriptId: row.id,
            position,
            speaker: deidentifySpeaker(t.speaker, speakerContext).slice(0, 80),
            startMs: t.startMs,
            start: remapOffset(t.start, edits, 'start'),
            end: remapOffset(t.end, edits, 'end'),
          })).map((t) => ({ ...t, text: text.slice(t.start, t.end) })),
        )
        if (log.length) {
          await manager.insert(AnonymisationLogEntry, log.map((l) => ({ studyId, transcriptId: row.id, original: l.original.slice(0, 300), placeholder: l.placeholder, category: l.category, byId: actor.id, byName: by })))
        }
        await manager.update(Study, { id: studyId }, { placeholderRegistry: registry.toJSON() as never })
        const stored = await this.storage.put(objectKey, Buffer.from(text, 'utf8'), 'text/plain; charset=utf-8')
        await manager.update(Transcript, { id: row.id }, { status: 'approved', objectKey, sha256: stored.sha256, flags: [] as never, quarantinePrefix: null, approvedById: actor.id, approvedAt: new Date() })
        await this.audit.record(actor, { action: 'transcript.approved', studyId, targetType: 'transcript', targetId: row.id, details: { version: row.version, replacements: log.length, sha256: stored.sha256 } }, manager)
      })
    } catch (error) {
      await this.storage.delete(objectKey).catch(() => {})
      if (storageFailure(error)) throw new AppError(503, 'unavailable', 'File storage unavailable', 'The transcript could not be stored right now, and nothing was saved. Please try approving again in a minute.')
      throw error
    }
    await this.removeQuarantine(row.quarantinePrefix)
    const approved = await this.dataSource.getRepository(Transcript).findOneByOrFail({ id: row.id })
    return (await this.summaries([approved]))[0]!
  }

  async reject(studyId: string, transcriptId: string, actor: AuditActor): Promise<TranscriptSummary> {
    const { row } = await this.inReview(studyId, transcriptId)
    await this.dataSource.transaction(async (manager) => {
      await manager.update(Transcript, { id: row.id }, { status: 'rejected', flags: [] as never, quarantinePrefix: null })
      await this.audit.record(actor, { action: 'transcript.rejected', studyId, targetType: 'transcript', targetId: row.id, details: { version: row.version } }, manager)
    })
    await this.removeQuarantine(row.quarantinePrefix)
    return (await this.summaries([{ ...row, status: 'rejected' } as Transcript]))[0]!
  }

  /** The approved, de-identified text, for anyone who may read it and only while consent allows coding. */
  async read(studyId: string, transcriptId: string): Promise<TranscriptReading> {
    const { row, text, reading } = await this.approved(studyId, transcriptId, true)
    const summary = summaryOf(row, reading!)
    return { ...summary, text, sha256: row.sha256, turns: reading!.turns.map((t) => ({ speaker: t.speaker, startMs: t.start_ms, start: t.start_offset, end: t.end_offset })) }
  }

  /**
   * An approved transcript's de-identified text, when its participant's data may be coded (else 404).
   * Approved text never changes (a correction is a new version), so it is kept in a small cache keyed
   * by its SHA-256: coding checks every excerpt against it.
   */
  async codableText(studyId: string, transcriptId: string): Promise<{ participantId: string; text: string }> {
    const { row, text } = await this.approved(studyId, transcriptId)
    return { participantId: row.participantId, text }
  }

  /**
   * One round trip: the approved transcript, its participant's data use and, for reading, the
   * pseudonym, interview date and turns (reading asks on every transcript it opens, coding on every
   * excerpt it writes).
   */
  private async approved(studyId: string, transcriptId: string, forReading = false): Promise<{ row: SummaryRow & { sha256: string }; text: string; reading?: ReadingRow }> {
    const found = await this.consent.rowWithDataUse<ApprovedRow & Partial<ReadingRow>>(
      studyId,
      `SELECT t.id, t.interview_id, t.participant_id, t.version, t.status, t.format, t.word_count, t.created_at, t.object_key, t.sha256
              ${forReading
                ? `, p.pseudonym, i.scheduled_at,
                   (SELECT coalesce(json_agg(json_build_object('speaker', tt.speaker, 'start_ms', tt.start_ms, 'start_offset', tt.start_offset, 'end_offset', tt.end_offset) ORDER BY tt.position), '[]')
                      FROM transcript_turns tt WHERE tt.transcript_id = t.id) AS turns`
                : ''}
         FROM transcripts t ${forReading ? 'LEFT JOIN interviews i ON i.id = t.interview_id LEFT JOIN participants p ON p.id = t.participant_id' : ''}
        WHERE t.id = $2 AND t.study_id = $1 AND t.status = 'approved' AND t.object_key IS NOT NULL`,
      [transcriptId],
    )
    if (!found || !found.use.mayCode) throw new NotFoundError('approved transcript')
    const { row: r } = found
    let text = this.approvedTexts.get(r.sha256)
    if (text === undefined) {
      text = (await this.storage.get(r.object_key, r.sha256)).toString('utf8')
      if (this.approvedTexts.size >= 32) this.approvedTexts.delete(this.approvedTexts.keys().next().value!)
      this.approvedTexts.set(r.sha256, text)
    }
    const row = {
      id: r.id,
      interviewId: r.interview_id,
      participantId: r.participant_id,
      version: r.version,
      status: r.status,
      format: r.format,
      wordCount: r.word_count,
      createdAt: new Date(r.created_at),
      sha256: r.sha256,
    }
    return { row, text, ...(forReading ? { reading: { pseudonym: r.pseudonym ?? null, scheduled_at: r.scheduled_at ?? null, turns: r.turns ?? [] } } : {}) }
  }

  async terms(studyId: string): Promise<DeidentificationTerms> {
    const study = await this.dataSource.getRepository(Study).findOneBy({ id: studyId })
    if (!study) throw new NotFoundError('study')
    return { terms: study.deidentificationTerms }
  }

  async setTerms(studyId: string, input: DeidentificationTerms, actor: AuditActor): Promise<DeidentificationTerms> {
    const terms = input.terms.map((t) => ({ term: t.term.normalize('NFC'), category: asCategory(t.category) }))
    await this.dataSource.transaction(async (manager) => {
      await manager.update(Study, { id: studyId }, { deidentificationTerms: terms as never })
      // the terms themselves may identify people or places: the trail records only how many there are
      await this.audit.record(actor, { action: 'deidentification.terms_changed', studyId, targetType: 'study', targetId: studyId, details: { count: terms.length } }, manager)
    })
    return { terms }
  }

  async anonymisationLog(studyId: string) {
    const entries = await this.dataSource.getRepository(AnonymisationLogEntry).find({ where: { studyId }, order: { at: 'DESC' }, take: 2000 })
    const transcripts = await this.summaries(entries.length ? await this.dataSource.getRepository(Transcript).findBy([...new Set(entries.map((e) => e.transcriptId))].map((id) => ({ id }))) : [])
    const byId = new Map(transcripts.map((t) => [t.id, t]))
    return entries.map((e) => ({ id: e.id, transcriptId: e.transcriptId, pseudonym: byId.get(e.transcriptId)?.pseudonym ?? '', version: byId.get(e.transcriptId)?.version ?? 0, original: e.original, placeholder: e.placeholder, category: e.category, by: e.byName, at: e.at.toISOString() }))
  }
}
