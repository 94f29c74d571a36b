import type { DataSource } from 'typeorm'
import { IsNull } from 'typeorm'
import { describeWithdrawalRule, withinWithdrawalDeadline } from '../../../shared/consent/index.js'
import type { PublicWithdrawalPage, PublicWithdrawalSubmit, WithdrawalInput, WithdrawalRequest as WithdrawalRequestDto } from '../../../shared/schemas/consent.js'
import { ConflictError, GoneError, NotFoundError, ValidationError } from '../../lib/errors.js'
import { hashToken } from '../../lib/tokens.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { MailService } from '../mail/mail.service.js'
import { ParticipantContact } from '../recruitment/participant-contact.entity.js'
import { addTimelineEvent } from '../recruitment/participant-timeline.js'
import { Participant } from '../recruitment/participant.entity.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'
import { ConsentLink } from './consent-link.entity.js'
import { ConsentRecord } from './consent-record.entity.js'
import { Withdrawal, WithdrawalRequest } from './withdrawal.entity.js'

const SCOPE_WORDS = { stop_keep_data: 'stop taking part and keep the data collected so far', withdraw_data: 'stop taking part and withdraw their data' } as const

/**
 * Withdrawal is one action. Withdrawing data inside the study's deadline takes the participant's data
 * out of analysis, exports and partner views at once (the data-use policy reads `dataRemoved`); after
 * the deadline the lead records what was decided. The participant can ask through the link in their
 * consent receipt, without an account (GDPR Art. 7(3)).
 */
export class WithdrawalService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly mail: MailService,
  ) {}

  async record(studyId: string, participantId: string, input: WithdrawalInput, actor: AuditActor): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const p = await manager.findOne(Participant, { where: { id: participantId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!p) throw new NotFoundError('participant')
      if (await manager.existsBy(Withdrawal, { participantId })) throw new ConflictError(`${p.pseudonym}'s withdrawal is already recorded.`)
      if (p.status !== 'consented') throw new ConflictError(`${p.pseudonym} has not consented, so there is nothing to withdraw from. Their enquiry stays in the screening log.`)
      const study = await manager.findOneByOrFail(Study, { id: studyId })
      const withinDeadline = withinWithdrawalDeadline(study.withdrawalRule, { requestedOn: input.effectiveDate, interviewDate: null, analysisStartedOn: null })
      if (input.scope === 'withdraw_data' && !withinDeadline && !input.decisionNote.trim()) {
        throw new ValidationError(
          `The deadline for withdrawing data has passed (${describeWithdrawalRule(study.withdrawalRule)}). Write down what the team decided about this person's data.`,
          [{ path: 'decisionNote', message: 'Record the decision about the data collected so far.' }],
        )
      }
      const dataRemoved = input.scope === 'withdraw_data' && withinDeadline
      const by = actor.id ? ((await manager.findOneBy(User, { id: actor.id }))?.name ?? null) : null
      await manager.insert(Withdrawal, {
        studyId,
        participantId,
        scope: input.scope,
        effectiveDate: input.effectiveDate,
        reason: input.reason,
        withinDeadline,
        dataRemoved,
        decisionNote: input.decisionNote,
        recordedById: actor.id,
        recordedByName: by,
      })
      await manager.update(Participant, { id: participantId }, { status: 'withdrawn', lastActivityAt: () => 'now()' })
      await manager.update(ConsentLink, { participantId, usedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() })
      if (input.requestId) await manager.update(WithdrawalRequest, { id: input.requestId, participantId }, { status: 'recorded' })
      await addTimelineEvent(manager, p, 'note', `Withdrew: ${SCOPE_WORDS[input.scope]}${dataRemoved ? '; data removed from analysis' : ''}`, actor)
      await this.audit.record(
        actor,
        { action: 'participant.withdrawn', studyId, targetType: 'participant', targetId: participantId, details: { scope: input.scope, withinDeadline, dataRemoved, excludedFromAnalysis: dataRemoved } },
        manager,
      )
      const contact = await manager.findOneBy(ParticipantContact, { participantId })
      if (contact?.email) {
        await this.mail.enqueue(manager, {
          to: contact.email,
          subject: `Your withdrawal from the study "${study.title}"`,
          body:
            `Hello ${contact.name},\n\nWe have recorded that you ${input.scope === 'withdraw_data' ? 'asked to stop taking part and to withdraw your data' : 'have stopped taking part'}. ` +
            `${dataRemoved ? 'Your data will no longer be used in the analysis.' : input.scope === 'withdraw_data' ? 'The study team will tell you what happens to the data already collected.' : 'Thank you for the time you gave to the study.'}\n\n` +
            `You do not need to do anything else.\n`,
        })
      }
    })
  }

  private async recordFor(token: string) {
    const record = await this.dataSource.getRepository(ConsentRecord).findOneBy({ withdrawalTokenHash: hashToken(token) })
    if (!record) throw new GoneError('This link is not valid. Please contact the study team directly; they will help you.')
    return record
  }

  async publicPage(token: string): Promise<PublicWithdrawalPage> {
    const record = await this.recordFor(token)
    const study = await this.dataSource.getRepository(Study).findOneByOrFail({ id: record.studyId })
    const already =
      (await this.dataSource.getRepository(WithdrawalRequest).existsBy({ participantId: record.participantId, status: 'open' })) ||
      (await this.dataSource.getRepository(Withdrawal).existsBy({ participantId: record.participantId }))
    return { studyTitle: study.title, deadlineText: describeWithdrawalRule(study.withdrawalRule), alreadyRequested: already }
  }

  /** The participant's own request: it lands in the team's queue and is acknowledged by e-mail. */
  async publicRequest(token: string, input: PublicWithdrawalSubmit): Promise<void> {
    const record = await this.recordFor(token)
    await this.dataSource.transaction(async (manager) => {
      const p = await manager.findOne(Participant, { where: { id: record.participantId }, lock: { mode: 'pessimistic_write' } })
      if (!p) throw new GoneError('This link is not valid. Please contact the study team directly.')
      if (await manager.existsBy(WithdrawalRequest, { participantId: p.id, status: 'open' })) return
      if (await manager.existsBy(Withdrawal, { participantId: p.id })) return
      const saved = await manager.save(manager.create(WithdrawalRequest, { studyId: p.studyId, participantId: p.id, scope: input.scope, reason: input.reason }))
      await addTimelineEvent(manager, p, 'note', `Asked to ${SCOPE_WORDS[input.scope].replace('their', 'their own')} (through the receipt link)`, null)
      await this.audit.record({ id: null, email: null, ip: null }, { action: 'participant.withdrawal_requested', studyId: p.studyId, targetType: 'participant', targetId: p.id, details: { scope: input.scope, requestId: saved.id } }, manager)
      const contact = await manager.findOneBy(ParticipantContact, { participantId: p.id })
      const study = await manager.findOneByOrFail(Study, { id: p.studyId })
      if (contact?.email) {
        await this.mail.enqueue(manager, {
          to: contact.email,
          subject: `We received your request about the study "${study.title}"`,
          body: `Hello ${contact.name},\n\nWe received your request to ${input.scope === 'withdraw_data' ? 'stop taking part and withdraw your data' : 'stop taking part'}. The study team will confirm by e-mail when it is done.\n\nThank you for the time you gave to the study.\n`,
        })
      }
    })
  }

  async openRequests(studyId: string): Promise<WithdrawalRequestDto[]> {
    const rows = await this.dataSource.getRepository(WithdrawalRequest).find({ where: { studyId, status: 'open' }, order: { requestedAt: 'ASC' } })
    const participants = new Map((await this.dataSource.getRepository(Participant).findBy({ studyId })).map((p) => [p.id, p.pseudonym]))
    return rows.map((r) => ({ id: r.id, participantId: r.participantId, pseudonym: participants.get(r.participantId) ?? '', scope: r.scope, reason: r.reason, requestedAt: r.requestedAt.toISOString(), status: r.status }))
  }
}
