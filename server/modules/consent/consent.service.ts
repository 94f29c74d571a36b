import { randomUUID } from 'node:crypto'
import type { DataSource, EntityManager } from 'typeorm'
import { IsNull } from 'typeorm'
import { dataUsePolicy } from '../../../shared/consent/index.js'
import type { ClauseAnswers, ParticipantConsentView, PublicConsentPage, PublicConsentResult, StaffConsentInput } from '../../../shared/schemas/consent.js'
import { ConflictError, GoneError, NotFoundError, ValidationError, type FieldError } from '../../lib/errors.js'
import { keyedHash } from '../../lib/hash.js'
import { hashToken, newToken } from '../../lib/tokens.js'
import type { ObjectStore } from '../../storage/object-store.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { MailService } from '../mail/mail.service.js'
import { ParticipantContact } from '../recruitment/participant-contact.entity.js'
import { addTimelineEvent } from '../recruitment/participant-timeline.js'
import { Participant } from '../recruitment/participant.entity.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'
import { ConsentForm } from './consent-form.entity.js'
import { ConsentLink } from './consent-link.entity.js'
import { ConsentRecord } from './consent-record.entity.js'
import { buildConsentReceipt } from './consent-receipt.js'
import { currentRecord, meaningFor, toRecordDto, toWithdrawalDto } from './consent-views.js'
import { Withdrawal } from './withdrawal.entity.js'

const LINK_DAYS = 14
const LINK_GONE = 'This consent link has expired, was already used, or is not valid. Please contact the study team and ask for a new link.'

export interface SignedFile {
  buffer: Buffer
  name: string
  contentType: string
}

/** Clause answers must be an explicit yes or no for exactly the clauses the version asks about. */
function clauseProblems(form: ConsentForm, answers: ClauseAnswers): FieldError[] {
  const problems: FieldError[] = []
  for (const key of Object.keys(answers)) {
    if (!form.clauses.some((c) => c.key === key)) problems.push({ path: `clauses.${key}`, message: 'This version does not ask about this.' })
  }
  for (const clause of form.clauses) {
    if (typeof answers[clause.key] !== 'boolean') problems.push({ path: `clauses.${clause.key}`, message: 'Answer yes or no.' })
    else if (clause.requiredForParticipation && answers[clause.key] === false) {
      problems.push({ path: `clauses.${clause.key}`, message: 'The study needs a yes to this to include you. If you do not agree, you do not need to sign.' })
    }
  }
  return problems
}

/** The data-use policy for one participant, from their consent records and withdrawal. */
interface RecordRow {
  id: string
  participantId: string
  formId: string
  correctsId: string | null
  clauses: Record<string, boolean>
  createdAt: string
}

function policyFor(records: ConsentRecord[], withdrawal: Withdrawal | null, forms: Map<string, ConsentForm>) {
  const current = currentRecord(records)
  const form = current ? forms.get(current.formId) : undefined
  return dataUsePolicy({
    consent: current && form ? { clauses: current.clauses, formClauses: form.clauses } : null,
    withdrawal: withdrawal ? { scope: withdrawal.scope, dataRemoved: withdrawal.dataRemoved } : null,
  })
}

type DataUseRow = { records: RecordRow[]; withdrawals: Pick<Withdrawal, 'participantId' | 'scope' | 'dataRemoved'>[]; forms: Pick<ConsentForm, 'id' | 'clauses'>[] }

/** The consent records, withdrawals and forms the data-use policy reads, for the participants in `ids` (an SQL uuid[]; $1 is the study). */
function dataUseColumns(ids: string): string {
  return `(SELECT coalesce(json_agg(json_build_object('id', id, 'participantId', participant_id, 'formId', form_id, 'correctsId', corrects_id, 'clauses', clauses, 'createdAt', created_at)), '[]')
            FROM consent_records WHERE study_id = $1 AND participant_id = ANY(${ids})) AS records,
         (SELECT coalesce(json_agg(json_build_object('participantId', participant_id, 'scope', scope, 'dataRemoved', data_removed)), '[]')
            FROM withdrawals WHERE study_id = $1 AND participant_id = ANY(${ids})) AS withdrawals,
         (SELECT coalesce(json_agg(json_build_object('id', id, 'clauses', clauses)), '[]') FROM consent_forms WHERE study_id = $1) AS forms`
}

function policies(ids: string[], row: DataUseRow): Map<string, ReturnType<typeof dataUsePolicy>> {
  const records = row.records.map((r) => ({ ...r, createdAt: new Date(r.createdAt) })) as unknown as ConsentRecord[]
  const withdrawals = row.withdrawals as Withdrawal[]
  const formById = new Map((row.forms as ConsentForm[]).map((f) => [f.id, f]))
  const result = new Map<string, ReturnType<typeof dataUsePolicy>>()
  for (const id of ids) {
    result.set(id, policyFor(records.filter((r) => r.participantId === id), withdrawals.find((w) => w.participantId === id) ?? null, formById))
  }
  return result
}

export class ConsentService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly storage: ObjectStore,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly publicUrl: string,
    private readonly secret: string,
  ) {}

  /**
   * What may be done with each participant's data under the one data-use policy, for many
   * participants in three queries (no query per participant).
   */
  async dataUseFor(studyId: string, participantIds: string[]): Promise<Map<string, ReturnType<typeof dataUsePolicy>>> {
    const ids = [...new Set(participantIds)]
    if (!ids.length) return new Map()
    // one round trip with only the columns the policy reads: this runs on every coding request
    const [row]: DataUseRow[] = await this.dataSource.query(`SELECT ${dataUseColumns('$2::uuid[]')}`, [studyId, ids])
    return policies(ids, row!)
  }

  /**
   * One row of the caller's own query (`select`: at most one row with a `participant_id` column; $1 is
   * the study, the caller's parameters follow from $2) together with its participant's data use, in
   * one round trip: reading and coding ask for an approved transcript and its consent on every request.
   */
  async rowWithDataUse<R extends { participant_id: string }>(studyId: string, select: string, params: unknown[]): Promise<{ row: R; use: ReturnType<typeof dataUsePolicy> } | null> {
    const [found]: (R & DataUseRow)[] = await this.dataSource.query(
      `WITH target AS (${select}) SELECT target.*, ${dataUseColumns('ARRAY[target.participant_id]')} FROM target`,
      [studyId, ...params],
    )
    if (!found) return null
    const { records, withdrawals, forms, ...row } = found
    return { row: row as unknown as R, use: policies([found.participant_id], { records, withdrawals, forms }).get(found.participant_id)! }
  }

  /**
   * The same for every participant with an approved transcript in the study (whose data coding could
   * touch), finding them in the same round trip: the codebook, memos and themes ask on every request.
   * `withPurged` also counts approved transcripts whose data was since purged (the transcript list
   * still lists those).
   */
  async dataUseOfTranscribed(studyId: string, options: { withPurged?: boolean } = {}): Promise<Map<string, ReturnType<typeof dataUsePolicy>>> {
    const [row]: (DataUseRow & { ids: string[] })[] = await this.dataSource.query(
      `WITH transcribed AS (
         SELECT coalesce(array_agg(DISTINCT participant_id), '{}') AS ids FROM transcripts WHERE study_id = $1 AND status = 'approved' ${options.withPurged ? '' : 'AND purged_at IS NULL'})
       SELECT transcribed.ids::text[] AS ids, ${dataUseColumns('transcribed.ids')} FROM transcribed`,
      [studyId],
    )
    return policies(row!.ids, row!)
  }

  async view(studyId: string, participantId: string): Promise<ParticipantConsentView & { dataUse: ReturnType<typeof dataUsePolicy> }> {
    const manager = this.dataSource.manager
    if (!(await manager.existsBy(Participant, { id: participantId, studyId }))) throw new NotFoundError('participant')
    const [records, links, withdrawal] = await Promise.all([
      manager.find(ConsentRecord, { where: { participantId }, order: { createdAt: 'DESC' } }),
      manager.find(ConsentLink, { where: { participantId }, order: { createdAt: 'DESC' } }),
      manager.findOneBy(Withdrawal, { participantId }),
    ])
    const forms = new Map((await manager.findBy(ConsentForm, { studyId })).map((f) => [f.id, f]))
    const current = currentRecord(records)
    const now = new Date()
    const currentForm = current ? forms.get(current.formId)! : null
    return {
      records: records.map((r) => toRecordDto(r, forms.get(r.formId)!, records)),
      current: current ? toRecordDto(current, currentForm!, records) : null,
      links: links.map((l) => ({
        id: l.id,
        formLabel: forms.get(l.formId)?.label ?? '',
        sentAt: l.createdAt.toISOString(),
        expiresAt: l.expiresAt.toISOString(),
        status: l.usedAt ? 'used' : l.revokedAt ? 'revoked' : l.expiresAt < now ? 'expired' : 'waiting',
      })),
      withdrawal: withdrawal ? toWithdrawalDto(withdrawal) : null,
      dataUse: policyFor(records, withdrawal, forms),
    }
  }

  private async consentable(manager: EntityManager, studyId: string, participantId: string): Promise<Participant> {
    const p = await manager.findOne(Participant, { where: { id: participantId, studyId }, lock: { mode: 'pessimistic_write' } })
    if (!p) throw new NotFoundError('participant')
    if (p.status === 'withdrawn') throw new ConflictError(`${p.pseudonym} has withdrawn from the study; a new consent cannot be recorded.`)
    if (p.status !== 'eligible' && p.status !== 'consented') throw new ConflictError(`${p.pseudonym} is not eligible yet. Only eligible participants can consent.`)
    return p
  }

  /** Written (with the signed scan) or verbal consent recorded by the lead or a coordinator. */
  async recordByStaff(studyId: string, participantId: string, input: StaffConsentInput, signed: SignedFile | null, actor: AuditActor) {
    const id = randomUUID()
    const fileKey = signed ? `studies/${studyId}/consents/${id}/signed-form` : null
    const stored = signed ? await this.storage.put(fileKey!, signed.buffer, signed.contentType) : null
    try {
      await this.dataSource.transaction(async (manager) => {
        const p = await this.consentable(manager, studyId, participantId)
        const form = await manager.findOneBy(ConsentForm, { id: input.formId, studyId })
        if (!form) throw new ValidationError('Choose a consent form version of this study.', [{ path: 'formId', message: 'Unknown version.' }])
        const corrected = input.corrects ? await manager.findOneBy(ConsentRecord, { id: input.corrects, participantId }) : null
        if (input.corrects && !corrected) throw new ValidationError('The record to correct is not this participant’s.', [{ path: 'corrects', message: 'Unknown record.' }])
        if (form.status !== 'approved' && !(corrected && corrected.formId === form.id)) {
          throw new ConflictError(`Version ${form.label} is ${form.status}. Record consent on the approved version.`)
        }
        const problems = clauseProblems(form, input.clauses)
        if (problems.length) throw new ValidationError(problems[0]!.message, problems)
        const by = actor.id ? ((await manager.findOneBy(User, { id: actor.id }))?.name ?? null) : null
        const method = signed ? 'written' : 'verbal'
        await manager.insert(ConsentRecord, {
          id,
          studyId,
          participantId,
          formId: form.id,
          method,
          clauses: input.clauses,
          signerName: input.signerName,
          signedAt: input.givenAt ? new Date(input.givenAt) : new Date(),
          meaning: meaningFor(method, form.label, by, input.witnessName),
          obtainedById: actor.id,
          obtainedByName: by,
          witnessName: input.witnessName,
          documentSha256: form.documentSha256,
          signedFileKey: fileKey,
          signedFileName: signed?.name ?? null,
          signedFileSha256: stored?.sha256 ?? null,
          correctsId: input.corrects ?? null,
          note: input.note,
        })
        await manager.update(Participant, { id: p.id }, { status: 'consented' })
        await addTimelineEvent(manager, p, 'note', `${corrected ? 'Consent corrected' : `${method === 'written' ? 'Written' : 'Verbal'} consent recorded`} on version ${form.label}`, actor)
        await this.audit.record(actor, { action: corrected ? 'consent.corrected' : 'consent.recorded', studyId, targetType: 'participant', targetId: p.id, details: { method, version: form.label, consentId: id, corrects: input.corrects ?? null } }, manager)
      })
    } catch (error) {
      if (fileKey) await this.storage.delete(fileKey).catch(() => {})
      throw error
    }
    return this.view(studyId, participantId)
  }

  /** Sends a single-use link (14 days) to the participant's e-mail; an earlier waiting link stops working. */
  async sendLink(studyId: string, participantId: string, formId: string | undefined, actor: AuditActor) {
    await this.dataSource.transaction(async (manager) => {
      const p = await this.consentable(manager, studyId, participantId)
      const contact = await manager.findOneBy(ParticipantContact, { participantId })
      if (!contact?.email) throw new ConflictError(`${p.pseudonym} has no e-mail address. Add one, or record written or verbal consent.`)
      const form = formId ? await manager.findOneBy(ConsentForm, { id: formId, studyId }) : await manager.findOneBy(ConsentForm, { studyId, status: 'approved' })
      if (!form || form.status !== 'approved') throw new ConflictError('There is no approved consent form version to send. The lead approves one on the Consent forms page.')
      const study = await manager.findOneByOrFail(Study, { id: studyId })
      await manager.update(ConsentLink, { participantId, usedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() })
      const { token, hash } = newToken()
      await manager.insert(ConsentLink, { studyId, participantId, formId: form.id, tokenHash: hash, expiresAt: new Date(Date.now() + LINK_DAYS * 86_400_000), createdById: actor.id })
      await this.mail.enqueue(manager, {
        to: contact.email,
        subject: `Your consent form for the study "${study.title}"`,
        body:
          `Hello ${contact.name},\n\nThank you for your interest in the study "${study.title}". Please read the consent form and, if you agree to take part, sign it here (the link works once, for ${LINK_DAYS} days):\n\n` +
          `${this.publicUrl}/consent/${token}\n\nTaking part is your choice. If you have questions, reply to the study team before you sign.\n\nThis is a research study. It does not give medical advice or care.\n`,
      })
      await addTimelineEvent(manager, p, 'email', `E-consent link sent for version ${form.label}`, actor)
      await this.audit.record(actor, { action: 'consent.link_sent', studyId, targetType: 'participant', targetId: p.id, details: { version: form.label } }, manager)
    })
    return this.view(studyId, participantId)
  }

  private async linkFor(manager: EntityManager, token: string, lock = false) {
    const link = await manager.findOne(ConsentLink, { where: { tokenHash: hashToken(token) }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) })
    if (!link || link.usedAt || link.revokedAt || link.expiresAt < new Date()) throw new GoneError(LINK_GONE)
    const form = await manager.findOneByOrFail(ConsentForm, { id: link.formId })
    const study = await manager.findOneByOrFail(Study, { id: link.studyId })
    return { link, form, study }
  }

  async publicPage(token: string): Promise<PublicConsentPage> {
    const { form, study } = await this.linkFor(this.dataSource.manager, token)
    return { studyTitle: study.title, formLabel: form.label, text: form.text, fileName: form.fileName, clauses: form.clauses, today: new Date().toISOString().slice(0, 10) }
  }

  async publicFile(token: string) {
    const { form } = await this.linkFor(this.dataSource.manager, token)
    return { name: form.fileName, contentType: form.fileContentType, body: await this.storage.get(form.fileKey, form.fileSha256) }
  }

  /**
   * The participant signs. The link row is locked, so two submissions at the same moment give exactly
   * one record; the receipt PDF is stored first and removed again if the record cannot be saved.
   */
  async publicSign(token: string, input: { clauses: ClauseAnswers; signerName: string }, client: { ip: string; userAgent: string }): Promise<PublicConsentResult> {
    const id = randomUUID()
    let receiptKey: string | null = null
    try {
      return await this.dataSource.transaction(async (manager) => {
        const { link, form, study } = await this.linkFor(manager, token, true)
        const problems = clauseProblems(form, input.clauses)
        if (problems.length) throw new ValidationError(problems[0]!.message, problems)
        const p = await this.consentable(manager, study.id, link.participantId)
        const contact = await manager.findOneBy(ParticipantContact, { participantId: p.id })
        const signedAt = new Date()
        const meaning = meaningFor('electronic', form.label, null, '')
        const withdrawal = newToken()
        const pdf = await buildConsentReceipt({
          studyTitle: study.title,
          formLabel: form.label,
          signerName: input.signerName,
          signedAt,
          meaning,
          clauses: form.clauses.map((c) => ({ wording: c.wording, answer: input.clauses[c.key]! })),
          documentSha256: form.documentSha256,
          withdrawalLink: `${this.publicUrl}/withdraw/${withdrawal.token}`,
        })
        receiptKey = `studies/${study.id}/consents/${id}/receipt.pdf`
        await this.storage.put(receiptKey, pdf, 'application/pdf')
        await manager.insert(ConsentRecord, {
          id,
          studyId: study.id,
          participantId: p.id,
          formId: form.id,
          method: 'electronic',
          clauses: input.clauses,
          signerName: input.signerName,
          signedAt,
          meaning,
          witnessName: '',
          documentSha256: form.documentSha256,
          receiptKey,
          addressHash: keyedHash(this.secret, client.ip),
          userAgent: client.userAgent.slice(0, 300),
          withdrawalTokenHash: withdrawal.hash,
        })
        await manager.update(ConsentLink, { id: link.id }, { usedAt: signedAt })
        await manager.update(Participant, { id: p.id }, { status: 'consented' })
        await addTimelineEvent(manager, p, 'note', `Signed the consent form (version ${form.label}) electronically`, null)
        if (contact?.email) {
          await this.mail.enqueue(manager, {
            to: contact.email,
            subject: `Your signed consent for the study "${study.title}"`,
            body:
              `Hello ${input.signerName},\n\nThank you. Your signed consent form is attached for your records.\n\n` +
              `Taking part is your choice, and you can stop at any time. To stop, or to ask for your data to be removed, use this link:\n\n${this.publicUrl}/withdraw/${withdrawal.token}\n\n` +
              `This is a research study. It does not give medical advice or care.\n`,
            attachments: [{ filename: 'consent-receipt.pdf', contentType: 'application/pdf', storageKey: receiptKey }],
          })
          await addTimelineEvent(manager, p, 'email', 'Consent receipt e-mailed', null)
        }
        await this.audit.record({ id: null, email: null, ip: null }, { action: 'consent.signed_electronically', studyId: study.id, targetType: 'participant', targetId: p.id, details: { version: form.label, consentId: id, documentSha256: form.documentSha256 } }, manager)
        return { signedAt: signedAt.toISOString(), signerName: input.signerName, meaning, formLabel: form.label, studyTitle: study.title }
      })
    } catch (error) {
      if (receiptKey) await this.storage.delete(receiptKey).catch(() => {})
      throw error
    }
  }

  async receipt(studyId: string, participantId: string, consentId: string): Promise<Buffer> {
    const record = await this.dataSource.getRepository(ConsentRecord).findOneBy({ id: consentId, participantId, studyId })
    if (!record?.receiptKey) throw new NotFoundError('receipt (only electronic consents have one)')
    return this.storage.get(record.receiptKey)
  }
}
