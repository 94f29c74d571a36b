import { In, type DataSource } from 'typeorm'
import type { PartnerAnswerInput, PartnerRound, PartnerTheme } from '../../../shared/schemas/themes.js'
import { ConflictError, NotFoundError } from '../../lib/errors.js'
import type { ConsentService } from '../consent/consent.service.js'
import { characteristicLabels } from '../recruitment/characteristic-labels.js'
import { Study } from '../studies/study.entity.js'
import { PartnerAnswer, ReviewRound, ReviewRoundTheme } from './review-round.entity.js'
import { longDate } from './review-mail.js'
import { roundStatus } from './review-round.service.js'
import { Theme } from './theme.entity.js'

/**
 * The patient partner's side of a review round. Everything a partner receives passes through here:
 * theme names and plain-language descriptions, and only those excerpts the lead shared that the
 * consent policy allows partners to see (quotation agreed, data not withdrawn) — with the pseudonym
 * and the characteristics the lead chose, nothing else. No transcript, record or contact detail.
 */
export class PartnerReviewService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly consent: ConsentService,
  ) {}

  async rounds(studyId: string, partnerId: string) {
    const rounds = await this.dataSource.getRepository(ReviewRound).find({ where: { studyId }, order: { createdAt: 'DESC' } })
    const counts: { round_id: string; themes: number; answered: number }[] = rounds.length
      ? await this.dataSource.query(
          `SELECT rt.round_id, count(*)::int AS themes,
                  count(*) FILTER (WHERE EXISTS (SELECT 1 FROM partner_answers a WHERE a.round_id = rt.round_id AND a.theme_id = rt.theme_id AND a.partner_id = $2 AND a.submitted_at IS NOT NULL))::int AS answered
             FROM review_round_themes rt WHERE rt.round_id = ANY($1::uuid[]) GROUP BY rt.round_id`,
          [rounds.map((r) => r.id), partnerId],
        )
      : []
    const countOf = new Map(counts.map((c) => [c.round_id, c]))
    const list = rounds.map((r) => ({ id: r.id, title: r.title, closesOn: r.closesOn, status: roundStatus(r), themeCount: countOf.get(r.id)?.themes ?? 0, answered: countOf.get(r.id)?.answered ?? 0 }))
    return list.sort((a, b) => Number(a.status === 'closed') - Number(b.status === 'closed'))
  }

  async round(studyId: string, roundId: string, partnerId: string): Promise<PartnerRound> {
    const round = await this.dataSource.getRepository(ReviewRound).findOneBy({ id: roundId, studyId })
    if (!round) throw new NotFoundError('review round')
    const roundThemes = await this.dataSource.getRepository(ReviewRoundTheme).find({ where: { roundId }, order: { position: 'ASC' } })
    const themeIds = roundThemes.map((t) => t.themeId)
    const [themes, answers, study] = await Promise.all([
      this.dataSource.getRepository(Theme).find({ where: { id: In(themeIds) }, select: { id: true, name: true, plainDescription: true } }),
      this.dataSource.getRepository(PartnerAnswer).find({ where: { roundId, partnerId } }),
      this.dataSource.getRepository(Study).findOneByOrFail({ id: studyId }),
    ])
    const quotes = await this.quotes(studyId, themeIds, round.showCharacteristics, study)
    const themeOf = new Map(themes.map((t) => [t.id, t]))
    const answerOf = new Map(answers.map((a) => [a.themeId, a]))
    const out: PartnerTheme[] = roundThemes.map((rt) => {
      const theme = themeOf.get(rt.themeId)
      const a = answerOf.get(rt.themeId)
      return {
        id: rt.themeId,
        name: theme?.name ?? rt.themeName,
        plainDescription: theme?.plainDescription ?? 'The team has since removed this theme. Your answer is kept.',
        quotes: quotes.get(rt.themeId) ?? [],
        answer: {
          verdict: a?.verdict ?? null,
          comment: a?.comment ?? '',
          note: a?.note ?? '',
          shareNote: a?.shareNote ?? false,
          submittedAt: a?.submittedAt?.toISOString() ?? null,
          response: a?.response ?? '',
          respondedAt: a?.respondedAt?.toISOString() ?? null,
        },
      }
    })
    return {
      id: round.id,
      title: round.title,
      closesOn: round.closesOn,
      status: roundStatus(round),
      themeCount: out.length,
      answered: out.filter((t) => t.answer.submittedAt).length,
      message: round.message,
      themes: out,
    }
  }

  /** Shared excerpts per theme, each through the consent policy: mayShowPartners or nothing. */
  private async quotes(studyId: string, themeIds: string[], show: string[], study: Study): Promise<Map<string, PartnerTheme['quotes']>> {
    const rows: { theme_id: string; text: string; participant_id: string; pseudonym: string; characteristics: Record<string, string> }[] = themeIds.length
      ? await this.dataSource.query(
          `SELECT te.theme_id, e.text, e.participant_id, p.pseudonym, p.characteristics
             FROM theme_excerpts te JOIN excerpts e ON e.id = te.excerpt_id JOIN participants p ON p.id = e.participant_id
            WHERE te.theme_id = ANY($1::uuid[]) AND te.share_with_partners AND e.study_id = $2 AND e.text <> ''
            ORDER BY te.position`,
          [themeIds, studyId],
        )
      : []
    const uses = await this.consent.dataUseFor(studyId, rows.map((r) => r.participant_id))
    const out = new Map<string, PartnerTheme['quotes']>()
    for (const r of rows) {
      if (!uses.get(r.participant_id)?.mayShowPartners) continue
      const characteristics = characteristicLabels(study.samplingCharacteristics, show, r.characteristics)
      out.set(r.theme_id, [...(out.get(r.theme_id) ?? []), { text: r.text, pseudonym: r.pseudonym, characteristics }])
    }
    return out
  }

  async answer(studyId: string, roundId: string, themeId: string, partnerId: string, input: PartnerAnswerInput): Promise<PartnerTheme> {
    await this.dataSource.transaction(async (manager) => {
      const round = await manager.findOne(ReviewRound, { where: { id: roundId, studyId }, lock: { mode: 'pessimistic_read' } })
      if (!round) throw new NotFoundError('review round')
      if (!(await manager.existsBy(ReviewRoundTheme, { roundId, themeId }))) throw new NotFoundError('theme in this round')
      if (roundStatus(round) === 'closed')
        throw new ConflictError(`This round closed on ${longDate(round.closesOn)}, so your answer could not be saved. Your words are still on the screen: copy them and e-mail them to the research team if you would like them to see them.`)
      const existing = await manager.findOneBy(PartnerAnswer, { roundId, themeId, partnerId })
      const fields = { verdict: input.verdict, comment: input.comment, note: input.note ?? '', shareNote: input.shareNote ?? false, ...(input.submit ? { submittedAt: new Date() } : {}) }
      if (existing) await manager.update(PartnerAnswer, { id: existing.id }, fields)
      else await manager.insert(PartnerAnswer, { roundId, themeId, partnerId, ...fields })
    })
    const round = await this.round(studyId, roundId, partnerId)
    return round.themes.find((t) => t.id === themeId)!
  }
}
