import type { DataSource, EntityManager } from 'typeorm'
import type PgBoss from 'pg-boss'
import { LocalTimeError, localToUtc, utcToLocal } from '../../../shared/interviews/time.js'
import type { Interview as InterviewDto, InterviewOutcome, InterviewReschedule, InterviewSchedule } from '../../../shared/schemas/interviews.js'
import { ConflictError, NotFoundError, ValidationError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { ConsentService } from '../consent/consent.service.js'
import type { MailService } from '../mail/mail.service.js'
import { ParticipantContact } from '../recruitment/participant-contact.entity.js'
import { addTimelineEvent } from '../recruitment/participant-timeline.js'
import { Participant } from '../recruitment/participant.entity.js'
import { Membership } from '../studies/membership.entity.js'
import { Study } from '../studies/study.entity.js'
import { User } from '../users/user.entity.js'
import { interviewMail, type InterviewMailKind } from './interview-calendar.js'
import { InterviewGuide } from './interview-guide.entity.js'
import { Interview } from './interview.entity.js'

export const REMINDER_QUEUE = 'interview-reminder'
const DAY_MS = 86_400_000

function toUtc(localTime: string, zone: string): Date {
  try {
    return new Date(localToUtc(localTime, zone))
  } catch (error) {
    if (error instanceof LocalTimeError) throw new ValidationError(error.message, [{ path: 'localTime', message: error.message }])
    throw error
  }
}

export class InterviewService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly boss: PgBoss,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly consent: ConsentService,
  ) {}

  async list(studyId: string, participantId?: string): Promise<InterviewDto[]> {
    const rows = await this.dataSource.getRepository(Interview).find({ where: { studyId, ...(participantId ? { participantId } : {}) }, order: { scheduledAt: 'ASC' } })
    return this.toDtos(rows)
  }

  private async toDtos(rows: Interview[]): Promise<InterviewDto[]> {
    if (!rows.length) return []
    const [participants, users, guides, counts] = await Promise.all([
      this.dataSource.getRepository(Participant).findBy(rows.map((r) => ({ id: r.participantId }))),
      this.dataSource.getRepository(User).findBy(rows.map((r) => ({ id: r.interviewerId }))),
      this.dataSource.getRepository(InterviewGuide).findBy({ studyId: rows[0]!.studyId }),
      this.dataSource.query(`SELECT interview_id, count(*)::int AS n FROM transcripts WHERE interview_id = ANY($1) GROUP BY interview_id`, [rows.map((r) => r.id)]),
    ])
    const pseudonym = new Map(participants.map((p) => [p.id, p.pseudonym]))
    const name = new Map(users.map((u) => [u.id, u.name]))
    const guide = new Map(guides.map((g) => [g.id, g.label]))
    const transcripts = new Map<string, number>(counts.map((c: { interview_id: string; n: number }) => [c.interview_id, c.n]))
    return rows.map((r) => {
      const utc = r.scheduledAt.toISOString()
      return {
        id: r.id,
        participantId: r.participantId,
        pseudonym: pseudonym.get(r.participantId) ?? '',
        scheduledAt: utc,
        participantTimeZone: r.participantTimeZone,
        interviewerTimeZone: r.interviewerTimeZone,
        participantLocal: utcToLocal(utc, r.participantTimeZone).label,
        interviewerLocal: utcToLocal(utc, r.interviewerTimeZone).label,
        interviewerId: r.interviewerId,
        interviewerName: name.get(r.interviewerId) ?? '',
        mode: r.mode,
        plannedMinutes: r.plannedMinutes,
        actualMinutes: r.actualMinutes,
        guideId: r.guideId,
        guideLabel: r.guideId ? (guide.get(r.guideId) ?? null) : null,
        fieldNotes: r.fieldNotes,
        status: r.status,
        notesOnly: r.notesOnly,
        transcriptCount: transcripts.get(r.id) ?? 0,
      }
    })
  }

  async get(studyId: string, interviewId: string): Promise<InterviewDto> {
    const row = await this.dataSource.getRepository(Interview).findOneBy({ id: interviewId, studyId })
    if (!row) throw new NotFoundError('interview')
    return (await this.toDtos([row]))[0]!
  }

  private async checkPeople(manager: EntityManager, studyId: string, interviewerId: string, guideId: string | null) {
    const member = await manager.findOneBy(Membership, { studyId, userId: interviewerId })
    if (!member || member.role === 'partner') throw new ValidationError('Choose an interviewer from the study team.', [{ path: 'interviewerId', message: 'Not a team member who interviews.' }])
    if (guideId && !(await manager.existsBy(InterviewGuide, { id: guideId, studyId }))) throw new ValidationError('Choose an interview guide of this study.', [{ path: 'guideId', message: 'Unknown guide.' }])
  }

  /** Schedules an interview for a consented participant; confirmation now and a reminder a day before. */
  async schedule(studyId: string, input: InterviewSchedule, actor: AuditActor): Promise<InterviewDto> {
    const use = (await this.consent.view(studyId, input.participantId)).dataUse
    const id = await this.dataSource.transaction(async (manager) => {
      const p = await manager.findOne(Participant, { where: { id: input.participantId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!p) throw new NotFoundError('participant')
      if (p.status !== 'consented' || !use.mayCode) throw new ConflictError(`${p.pseudonym} has no valid consent on record, so an interview cannot be booked yet.`)
      await this.checkPeople(manager, studyId, input.interviewerId, input.guideId)
      const zone = input.timeZoneOf === 'participant' ? input.participantTimeZone : input.interviewerTimeZone
      const interview = await manager.save(
        manager.create(Interview, {
          studyId,
          participantId: p.id,
          scheduledAt: toUtc(input.localTime, zone),
          participantTimeZone: input.participantTimeZone,
          interviewerId: input.interviewerId,
          interviewerTimeZone: input.interviewerTimeZone,
          mode: input.mode,
          plannedMinutes: input.plannedMinutes,
          guideId: input.guideId,
          notesOnly: use.notesOnly,
        }),
      )
      await this.notify(manager, interview, 'confirmation')
      await this.scheduleReminder(manager, interview)
      await addTimelineEvent(manager, p, 'note', `Interview booked for ${interview.scheduledAt.toISOString().slice(0, 16).replace('T', ' ')} UTC${use.notesOnly ? ' (notes only: audio recording declined)' : ''}`, actor)
      await this.audit.record(actor, { action: 'interview.scheduled', studyId, targetType: 'interview', targetId: interview.id, details: { participant: p.pseudonym, at: interview.scheduledAt.toISOString() } }, manager)
      return interview.id
    })
    return this.get(studyId, id)
  }

  async reschedule(studyId: string, interviewId: string, input: InterviewReschedule, actor: AuditActor): Promise<InterviewDto> {
    await this.dataSource.transaction(async (manager) => {
      const interview = await manager.findOne(Interview, { where: { id: interviewId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!interview) throw new NotFoundError('interview')
      if (interview.status !== 'scheduled') throw new ConflictError(`This interview is ${interview.status}; only a scheduled one can change.`)
      const next = { ...interview }
      if (input.participantTimeZone) next.participantTimeZone = input.participantTimeZone
      if (input.interviewerTimeZone) next.interviewerTimeZone = input.interviewerTimeZone
      if (input.interviewerId || input.guideId !== undefined) await this.checkPeople(manager, studyId, input.interviewerId ?? interview.interviewerId, input.guideId ?? null)
      if (input.interviewerId) next.interviewerId = input.interviewerId
      if (input.guideId !== undefined) next.guideId = input.guideId
      if (input.mode) next.mode = input.mode
      if (input.plannedMinutes) next.plannedMinutes = input.plannedMinutes
      if (input.localTime) {
        const zone = (input.timeZoneOf ?? 'participant') === 'participant' ? next.participantTimeZone : next.interviewerTimeZone
        next.scheduledAt = toUtc(input.localTime, zone)
      }
      next.calendarSequence = interview.calendarSequence + 1
      await manager.save(Interview, next)
      await this.notify(manager, next as Interview, 'update')
      await this.scheduleReminder(manager, next as Interview)
      await this.audit.record(actor, { action: 'interview.rescheduled', studyId, targetType: 'interview', targetId: interviewId, details: { from: interview.scheduledAt.toISOString(), to: next.scheduledAt.toISOString() } }, manager)
    })
    return this.get(studyId, interviewId)
  }

  /** Done (with duration and field notes), missed or cancelled; a cancellation tells both people. */
  async recordOutcome(studyId: string, interviewId: string, input: InterviewOutcome, actor: AuditActor): Promise<InterviewDto> {
    await this.dataSource.transaction(async (manager) => {
      const interview = await manager.findOne(Interview, { where: { id: interviewId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!interview) throw new NotFoundError('interview')
      if (interview.status === 'cancelled') throw new ConflictError('This interview was cancelled.')
      if (input.status === 'done' && !input.actualMinutes) throw new ValidationError('Record how long the interview took.', [{ path: 'actualMinutes', message: 'Required when the interview took place.' }])
      const update: Partial<Interview> = { status: input.status, actualMinutes: input.actualMinutes, fieldNotes: input.fieldNotes }
      if (input.status === 'cancelled') {
        update.calendarSequence = interview.calendarSequence + 1
        await this.notify(manager, { ...interview, ...update } as Interview, 'cancellation')
      }
      await manager.update(Interview, { id: interviewId }, update)
      await this.audit.record(actor, { action: `interview.${input.status}`, studyId, targetType: 'interview', targetId: interviewId, details: { actualMinutes: input.actualMinutes } }, manager)
    })
    return this.get(studyId, interviewId)
  }

  private async people(manager: EntityManager, interview: Interview) {
    // one after the other: this runs inside the booking's transaction, on one connection
    const contact = await manager.findOneBy(ParticipantContact, { participantId: interview.participantId })
    const interviewer = await manager.findOneByOrFail(User, { id: interview.interviewerId })
    const study = await manager.findOneByOrFail(Study, { id: interview.studyId })
    const to = [{ email: interviewer.email, name: interviewer.name, timeZone: interview.interviewerTimeZone }]
    if (contact?.email) to.unshift({ email: contact.email, name: contact.name, timeZone: interview.participantTimeZone })
    return { to, study }
  }

  private async notify(manager: EntityManager, interview: Interview, kind: InterviewMailKind) {
    const { to, study } = await this.people(manager, interview)
    for (const person of to) await this.mail.enqueue(manager, interviewMail(kind, interview, person, study.title))
  }

  /** A reminder job 24 hours before; a later change makes the old job a no-op (its sequence is stale). */
  private async scheduleReminder(manager: EntityManager, interview: Interview) {
    const at = new Date(interview.scheduledAt.getTime() - DAY_MS)
    if (at.getTime() <= Date.now()) return
    const runner = manager.queryRunner!
    await this.boss.send(
      REMINDER_QUEUE,
      { interviewId: interview.id, sequence: interview.calendarSequence },
      { startAfter: at, retryLimit: 5, retryBackoff: true, db: { executeSql: async (text: string, values: unknown[]) => ({ rows: (await runner.query(text, values, true)).records }) } },
    )
  }

  /** Run by the reminder worker. */
  async sendReminder(interviewId: string, sequence: number): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const interview = await manager.findOneBy(Interview, { id: interviewId })
      if (!interview || interview.status !== 'scheduled' || interview.calendarSequence !== sequence) return
      await this.notify(manager, interview, 'reminder')
    })
  }
}
