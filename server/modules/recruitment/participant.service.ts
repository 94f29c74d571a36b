import type { DataSource, EntityManager } from 'typeorm'
import type { z } from 'zod'
import type { StudyRole } from '../../../shared/permissions.js'
import { evaluateEligibility, characteristicsFrom } from '../../../shared/eligibility/index.js'
import { answerProblems } from '../../../shared/eligibility/answer-problems.js'
import type { Answers, EligibilityResult, OverrideRequest, ParticipantDetail, participantListQuery, ParticipantPage, ReferralSource, StaffEnquiry, Contact } from '../../../shared/schemas/recruitment.js'
import { ConflictError, NotFoundError, ValidationError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { MailService } from '../mail/mail.service.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'
import { ParticipantContact } from './participant-contact.entity.js'
import { ParticipantEvent } from './participant-event.entity.js'
import { addTimelineEvent } from './participant-timeline.js'
import { pseudonymFor, screeningSummary, statusFor, toDetail, toRow } from './participant-views.js'
import { Participant } from './participant.entity.js'
import type { QuestionnaireService } from './questionnaire.service.js'
import { ScreeningQuestionnaire } from './screening-questionnaire.entity.js'
import { Screening } from './screening.entity.js'
import { acknowledgementMail } from './acknowledgement-mail.js'

export const CONTACT_ROLES: readonly StudyRole[] = ['lead', 'coordinator']
const today = () => new Date().toISOString().slice(0, 10)

export interface NewParticipant {
  contact: Contact
  consentToContact: boolean
  source: ReferralSource
  sourceDetail?: string
  answers?: Answers
  note?: string
}

export class ParticipantService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly questionnaires: QuestionnaireService,
  ) {}

  /**
   * Creates a participant with the next pseudonym. The study row is locked while its counter moves,
   * so concurrent enquiries get P01, P02, … with no gap and no duplicate; a failed enquiry rolls its
   * number back with everything else.
   */
  async create(studyId: string, input: NewParticipant, actor: AuditActor, options: { strictAnswers: boolean }): Promise<{ participant: Participant; result: EligibilityResult | null; study: Study }> {
    return this.dataSource.transaction(async (manager) => {
      const questionnaire = input.answers ? await this.requireQuestionnaire(manager, studyId) : null
      const result = questionnaire ? this.screen(questionnaire, input.answers!, options.strictAnswers) : null
      // TypeORM answers an UPDATE with [rows, affected]
      const [[row]] = await manager.query(
        `UPDATE studies SET participant_sequence = participant_sequence + 1 WHERE id = $1 RETURNING participant_sequence`,
        [studyId],
      )
      if (!row) throw new NotFoundError('study')
      const study = await manager.findOneByOrFail(Study, { id: studyId })
      const sequence = Number(row.participant_sequence)
      const participant = await manager.save(
        manager.create(Participant, {
          studyId,
          sequence,
          pseudonym: pseudonymFor(sequence),
          status: result ? statusFor(result) : 'enquired',
          helpSeeking: result?.helpSeeking ?? false,
          source: input.source,
          sourceDetail: input.sourceDetail ?? '',
          characteristics: questionnaire ? characteristicsFrom(questionnaire, input.answers!) : {},
        }),
      )
      await manager.insert(ParticipantContact, { participantId: participant.id, ...input.contact, consentToContact: input.consentToContact })
      const via = input.source === 'public_page' ? 'on the public study page' : `by ${actor.email ?? 'the team'} (${input.source.replace(/_/g, ' ')})`
      await addTimelineEvent(manager, participant, 'enquiry', `Enquired ${via}`, actor, { source: input.source })
      if (input.note) await addTimelineEvent(manager, participant, 'note', input.note.slice(0, 300), actor, {})
      if (questionnaire && result) {
        await manager.insert(Screening, { participantId: participant.id, questionnaireId: questionnaire.id, answers: input.answers!, result, screenedById: actor.id })
        await addTimelineEvent(manager, participant, 'screening', screeningSummary(result, questionnaire.version), actor, { outcome: result.outcome })
      }
      if (input.contact.email && input.source === 'public_page') {
        await this.mail.enqueue(manager, acknowledgementMail(study, input.contact, result))
        await addTimelineEvent(manager, participant, 'email', 'Acknowledgement e-mail queued', null, {})
      }
      await this.audit.record(
        actor,
        { action: 'participant.enquired', studyId, targetType: 'participant', targetId: participant.id, details: { pseudonym: participant.pseudonym, source: input.source, outcome: result?.outcome ?? null } },
        manager,
      )
      return { participant, result, study }
    })
  }

  async createByStaff(studyId: string, input: StaffEnquiry, actor: AuditActor): Promise<ParticipantDetail> {
    const { participant } = await this.create(
      studyId,
      { contact: input.contact, consentToContact: true, source: input.source, sourceDetail: input.sourceDetail, answers: input.answers, note: input.note },
      actor,
      { strictAnswers: false },
    )
    return this.detail(studyId, participant.id)
  }

  private async requireQuestionnaire(manager: EntityManager, studyId: string): Promise<ScreeningQuestionnaire> {
    const questionnaire = await this.questionnaires.currentEntity(studyId, manager)
    if (!questionnaire) throw new ConflictError('This study has no screening questions yet. The lead writes them on the Screening questions page.')
    return questionnaire
  }

  /** Validates the answers and evaluates them. Public answers must be complete; staff may leave gaps for review. */
  private screen(questionnaire: ScreeningQuestionnaire, answers: Answers, strict: boolean): EligibilityResult {
    const problems = answerProblems(questionnaire.questions, answers, today(), { requireAll: strict })
    if (problems.length) throw new ValidationError('Some answers need attention.', problems)
    return evaluateEligibility(questionnaire, answers, today())
  }

  async list(studyId: string, query: z.output<typeof participantListQuery>, role: StudyRole | null): Promise<ParticipantPage> {
    const withContact = role !== null && CONTACT_ROLES.includes(role)
    const qb = this.dataSource.getRepository(Participant).createQueryBuilder('p').where('p.study_id = :studyId', { studyId })
    if (withContact) qb.leftJoinAndMapOne('p.contact', ParticipantContact, 'c', 'c.participant_id = p.id')
    if (query.status) qb.andWhere('p.status = :status', { status: query.status })
    if (query.source) qb.andWhere('p.source = :source', { source: query.source })
    if (query.search) {
      const term = `%${query.search.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`
      qb.andWhere(withContact ? '(p.pseudonym ILIKE :term OR c.name ILIKE :term OR c.email ILIKE :term)' : 'p.pseudonym ILIKE :term', { term })
    }
    const order = query.sortDesc ? 'DESC' : 'ASC'
    if (query.sortBy === 'pseudonym') qb.orderBy('p.sequence', order)
    else qb.orderBy(query.sortBy === 'status' ? 'p.status' : 'p.last_activity_at', order).addOrderBy('p.sequence', 'ASC')
    qb.skip((query.page - 1) * query.pageSize).take(query.pageSize)
    const [rows, total] = await qb.getManyAndCount()
    return {
      total,
      page: query.page,
      pageSize: query.pageSize,
      participants: rows.map((p) => toRow(p, withContact ? ((p as Participant & { contact?: ParticipantContact }).contact ?? null) : null)),
    }
  }

  async detail(studyId: string, participantId: string): Promise<ParticipantDetail> {
    const manager = this.dataSource.manager
    const p = await manager.findOneBy(Participant, { id: participantId, studyId })
    if (!p) throw new NotFoundError('participant')
    const [contact, screenings, events] = await Promise.all([
      manager.findOneBy(ParticipantContact, { participantId }),
      manager.find(Screening, { where: { participantId }, relations: { questionnaire: true }, order: { at: 'DESC' } }),
      manager.find(ParticipantEvent, { where: { participantId }, order: { at: 'ASC' } }),
    ])
    const ids = [...new Set(screenings.map((s) => s.screenedById).filter((x): x is string => Boolean(x)))]
    const users = ids.length ? await manager.getRepository(User).findBy(ids.map((id) => ({ id }))) : []
    return toDetail(p, contact, screenings as (Screening & { questionnaire: ScreeningQuestionnaire })[], events, new Map(users.map((u) => [u.id, u.name])))
  }

  /** Screens again with the current questionnaire version; an earlier override no longer applies. */
  async rescreen(studyId: string, participantId: string, answers: Answers, note: string, actor: AuditActor): Promise<ParticipantDetail> {
    await this.dataSource.transaction(async (manager) => {
      const p = await manager.findOne(Participant, { where: { id: participantId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!p) throw new NotFoundError('participant')
      const questionnaire = await this.requireQuestionnaire(manager, studyId)
      const result = this.screen(questionnaire, answers, false)
      await manager.insert(Screening, { participantId, questionnaireId: questionnaire.id, answers, result, screenedById: actor.id })
      await manager.update(Participant, { id: participantId }, {
        status: statusFor(result),
        helpSeeking: result.helpSeeking,
        characteristics: characteristicsFrom(questionnaire, answers),
        override: null,
      })
      await addTimelineEvent(manager, p, 'screening', screeningSummary(result, questionnaire.version), actor, { outcome: result.outcome })
      if (note) await addTimelineEvent(manager, p, 'note', note, actor, {})
      await this.audit.record(actor, { action: 'participant.screened', studyId, targetType: 'participant', targetId: participantId, details: { version: questionnaire.version, outcome: result.outcome } }, manager)
    })
    return this.detail(studyId, participantId)
  }

  /** The lead decides differently from the computed outcome, with a written reason (audited). */
  async override(studyId: string, participantId: string, input: OverrideRequest, actor: AuditActor): Promise<ParticipantDetail> {
    await this.dataSource.transaction(async (manager) => {
      const p = await manager.findOne(Participant, { where: { id: participantId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!p) throw new NotFoundError('participant')
      if (!(await manager.existsBy(Screening, { participantId }))) throw new ConflictError('Screen this person first; an outcome can only be changed after a screening.')
      const by = actor.id ? ((await manager.findOneBy(User, { id: actor.id }))?.name ?? actor.email ?? 'the lead') : 'the lead'
      const override = { outcome: input.outcome, reason: input.reason, by, at: new Date().toISOString() }
      await manager.update(Participant, { id: participantId }, { status: input.outcome, override: override as never })
      await addTimelineEvent(manager, p, 'override', `Outcome changed to ${input.outcome.replace('_', ' ')}: ${input.reason}`, actor, { from: p.status, to: input.outcome })
      await this.audit.record(actor, { action: 'participant.outcome_overridden', studyId, targetType: 'participant', targetId: participantId, details: { from: p.status, to: input.outcome, reason: input.reason } }, manager)
    })
    return this.detail(studyId, participantId)
  }
}
