import { In, type DataSource, type EntityManager } from 'typeorm'
import type PgBoss from 'pg-boss'
import type { RoundCreate, RoundDetail, RoundSummary } from '../../../shared/schemas/themes.js'
import { ConflictError, NotFoundError, UnprocessableError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { MailService } from '../mail/mail.service.js'
import { Study } from '../studies/study.entity.js'
import { PartnerAnswer, ReviewRound, ReviewRoundTheme } from './review-round.entity.js'
import { roundOpenedMail, roundReminderMail } from './review-mail.js'
import { Theme } from './theme.entity.js'

export const ROUND_REMINDER_QUEUE = 'review-round-reminder'
const DAY_MS = 86_400_000

const today = () => new Date().toISOString().slice(0, 10)

/** A round is open until the lead closes it or its closing day has passed. */
export const roundStatus = (round: Pick<ReviewRound, 'status' | 'closesOn'>): 'open' | 'closed' => (round.status === 'open' && round.closesOn >= today() ? 'open' : 'closed')

/** The lead's side of a review round: open it (partners are e-mailed), read the answers, respond, close. */
export class ReviewRoundService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly boss: PgBoss,
    private readonly publicUrl: string,
  ) {}

  private partners(manager: EntityManager, studyId: string): Promise<{ id: string; name: string; email: string }[]> {
    return manager.query(`SELECT u.id, u.name, u.email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.study_id = $1 AND m.role = 'partner' AND NOT u.disabled ORDER BY u.name`, [studyId])
  }

  async list(studyId: string): Promise<RoundSummary[]> {
    const [rounds, partners] = await Promise.all([
      this.dataSource.getRepository(ReviewRound).find({ where: { studyId }, order: { createdAt: 'DESC' } }),
      this.partners(this.dataSource.manager, studyId),
    ])
    // the team's partners once for every round, not once per round
    return Promise.all(rounds.map((r) => this.summary(this.dataSource.manager, r, partners.length)))
  }

  private async summary(manager: EntityManager, round: ReviewRound, partnerCount?: number): Promise<RoundSummary> {
    // one after the other: `manager` may be a transaction's, and one connection runs one query at a time
    const themes = await manager.count(ReviewRoundTheme, { where: { roundId: round.id } })
    const partners = partnerCount ?? (await this.partners(manager, round.studyId)).length
    const done: { n: number }[] = await manager.query(
      `SELECT count(*)::int AS n FROM (SELECT partner_id FROM partner_answers WHERE round_id = $1 AND submitted_at IS NOT NULL GROUP BY partner_id HAVING count(*) >= $2) d`,
      [round.id, themes],
    )
    return { id: round.id, title: round.title, closesOn: round.closesOn, status: roundStatus(round), themeCount: themes, partners, partnersDone: themes ? done[0]!.n : 0, createdAt: round.createdAt.toISOString() }
  }

  async create(studyId: string, input: RoundCreate, actor: AuditActor): Promise<RoundDetail> {
    if (input.closesOn <= today()) throw new UnprocessableError('Choose a closing date after today, so partners have time to read and answer.', [{ path: 'closesOn', message: 'Choose a date after today.' }])
    const id = await this.dataSource.transaction(async (manager) => {
      const study = await manager.findOneByOrFail(Study, { id: studyId })
      const themes = await manager.find(Theme, { where: { id: In(input.themeIds), studyId } })
      if (themes.length !== new Set(input.themeIds).size) throw new UnprocessableError('One of the themes is not in this study (it may have been deleted). Reload and choose again.', [{ path: 'themeIds', message: 'Choose themes of this study.' }])
      const unplain = themes.filter((t) => !t.plainDescription.trim())
      if (unplain.length) throw new UnprocessableError(`Write a plain-language description for ${unplain.map((t) => `“${t.name}”`).join(', ')} first: that is what partners read.`, [{ path: 'themeIds', message: 'Every theme needs a plain-language description.' }])
      const keys = new Set(study.samplingCharacteristics.map((c) => c.key))
      const showCharacteristics = (input.showCharacteristics ?? []).filter((k) => keys.has(k))
      const round = await manager.save(manager.create(ReviewRound, { studyId, title: input.title, closesOn: input.closesOn, showCharacteristics, message: input.message ?? '' }))
      const order = new Map(input.themeIds.map((tid, i) => [tid, i]))
      await manager.insert(ReviewRoundTheme, themes.map((t) => ({ roundId: round.id, themeId: t.id, themeName: t.name, position: order.get(t.id)! })))
      await manager.query(`UPDATE themes SET status = 'with_partners', version = version + 1 WHERE id = ANY($1::uuid[]) AND status = 'draft'`, [themes.map((t) => t.id)])
      const link = `${this.publicUrl}/studies/${studyId}/review/${round.id}`
      const partners = await this.partners(manager, studyId)
      for (const p of partners) await this.mail.enqueue(manager, roundOpenedMail(p.email, p.name, study.title, round.title, round.closesOn, link, round.message))
      const remindAt = new Date(new Date(`${round.closesOn}T09:00:00Z`).getTime() - 2 * DAY_MS)
      if (remindAt.getTime() > Date.now()) {
        const runner = manager.queryRunner!
        await this.boss.send(ROUND_REMINDER_QUEUE, { roundId: round.id }, { startAfter: remindAt, retryLimit: 5, retryBackoff: true, db: { executeSql: async (text: string, values: unknown[]) => ({ rows: (await runner.query(text, values, true)).records }) } })
      }
      await this.audit.record(actor, { action: 'review_round.opened', studyId, targetType: 'review_round', targetId: round.id, details: { title: round.title, themes: themes.length, partners: partners.length, closesOn: round.closesOn } }, manager)
      return round.id
    })
    return this.detail(studyId, id)
  }

  async detail(studyId: string, roundId: string): Promise<RoundDetail> {
    const manager = this.dataSource.manager
    const round = await manager.findOneBy(ReviewRound, { id: roundId, studyId })
    if (!round) throw new NotFoundError('review round')
    const [summary, roundThemes, partners, answers] = await Promise.all([
      this.summary(manager, round),
      manager.find(ReviewRoundTheme, { where: { roundId }, order: { position: 'ASC' } }),
      this.partners(manager, studyId),
      manager.query(
        `SELECT a.*, u.name AS partner_name FROM partner_answers a JOIN users u ON u.id = a.partner_id WHERE a.round_id = $1 AND a.submitted_at IS NOT NULL ORDER BY a.submitted_at`,
        [roundId],
      ) as Promise<{ id: string; theme_id: string; partner_id: string; partner_name: string; verdict: RoundDetail['answers'][number]['verdict']; comment: string; note: string; share_note: boolean; submitted_at: Date; response: string; responded_at: Date | null }[]>,
    ])
    const live = new Set((await manager.find(Theme, { where: { id: In(roundThemes.map((t) => t.themeId)) }, select: { id: true } })).map((t) => t.id))
    return {
      ...summary,
      showCharacteristics: round.showCharacteristics,
      message: round.message,
      themes: roundThemes.map((t) => ({ id: t.themeId, name: t.themeName, deleted: !live.has(t.themeId) })),
      partnerList: partners.map((p) => ({ id: p.id, name: p.name })),
      answers: answers.map((a) => ({
        id: a.id,
        themeId: a.theme_id,
        partnerId: a.partner_id,
        partnerName: a.partner_name,
        verdict: a.verdict,
        comment: a.comment,
        sharedNote: a.share_note ? a.note : null,
        submittedAt: new Date(a.submitted_at).toISOString(),
        response: a.response,
        respondedAt: a.responded_at ? new Date(a.responded_at).toISOString() : null,
      })),
    }
  }

  async close(studyId: string, roundId: string, actor: AuditActor): Promise<RoundDetail> {
    await this.dataSource.transaction(async (manager) => {
      const round = await manager.findOne(ReviewRound, { where: { id: roundId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!round) throw new NotFoundError('review round')
      if (round.status === 'closed') throw new ConflictError('This round is already closed.')
      await manager.update(ReviewRound, { id: roundId }, { status: 'closed', closedAt: new Date() })
      await this.audit.record(actor, { action: 'review_round.closed', studyId, targetType: 'review_round', targetId: roundId, details: { title: round.title } }, manager)
    })
    return this.detail(studyId, roundId)
  }

  async respond(studyId: string, roundId: string, answerId: string, response: string, actor: AuditActor): Promise<RoundDetail> {
    await this.dataSource.transaction(async (manager) => {
      const answer = await manager.findOne(PartnerAnswer, { where: { id: answerId, roundId }, relations: { round: true } })
      if (!answer || answer.round.studyId !== studyId || !answer.submittedAt) throw new NotFoundError('answer')
      await manager.update(PartnerAnswer, { id: answerId }, { response, respondedAt: new Date() })
      await this.audit.record(actor, { action: 'review_round.responded', studyId, targetType: 'partner_answer', targetId: answerId, details: { roundId } }, manager)
    })
    return this.detail(studyId, roundId)
  }

  /** Run by the reminder job two days before a round closes: partners who have not sent every answer get a note. */
  async remind(roundId: string): Promise<number> {
    return this.dataSource.transaction(async (manager) => {
      const round = await manager.findOneBy(ReviewRound, { id: roundId })
      if (!round || round.status !== 'open') return 0
      const study = await manager.findOneByOrFail(Study, { id: round.studyId })
      const themes = await manager.count(ReviewRoundTheme, { where: { roundId } })
      const waiting: { email: string; name: string }[] = await manager.query(
        `SELECT u.email, u.name FROM memberships m JOIN users u ON u.id = m.user_id
          WHERE m.study_id = $1 AND m.role = 'partner' AND NOT u.disabled
            AND (SELECT count(*) FROM partner_answers a WHERE a.round_id = $2 AND a.partner_id = u.id AND a.submitted_at IS NOT NULL) < $3`,
        [round.studyId, roundId, themes],
      )
      const link = `${this.publicUrl}/studies/${round.studyId}/review/${round.id}`
      for (const p of waiting) await this.mail.enqueue(manager, roundReminderMail(p.email, p.name, study.title, round.title, round.closesOn, link))
      return waiting.length
    })
  }
}
