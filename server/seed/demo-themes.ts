import type { EntityManager } from 'typeorm'
import { PartnerAnswer, ReviewRound, ReviewRoundTheme } from '../modules/themes/review-round.entity.js'
import { Theme, ThemeCode, ThemeExcerpt } from '../modules/themes/theme.entity.js'
import type { Study } from '../modules/studies/study.entity.js'

/**
 * Demo themes in each status, and one closed review round with the patient partner's answers and the
 * team's responses. Every word is invented.
 */
const THEMES: { name: string; status: Theme['status']; codes: string[]; description: string; plain: string; parent?: string }[] = [
  {
    name: 'Sent home in a hurry',
    status: 'agreed',
    codes: ['Rushed discharge', 'Waiting on the day'],
    description: 'Discharge is experienced as abrupt and poorly paced: long waits end in a rushed exit with little explanation.',
    plain: 'Leaving hospital felt rushed. Families waited all day, then had to leave fast. Few people explained what came next.',
  },
  {
    name: 'Nobody to ask',
    status: 'with_partners',
    codes: ['One person to call', 'Formal help slow', 'Conflicting advice'],
    description: 'Carers navigate fragmented services and want a single, reachable point of contact.',
    plain: 'Carers did not know who to call. Services passed them on. One person who answers the phone made a big difference.',
  },
  {
    name: 'Keeping watch at night',
    status: 'draft',
    codes: ['Night-time worry', 'Stairs and bathroom'],
    description: 'Hypervigilance in the first weeks, centred on the night and on physical risks in the home.',
    plain: 'In the first weeks, carers stayed alert at night. They worried about falls and new signs of stroke.',
  },
  {
    name: 'Small changes at home',
    status: 'draft',
    codes: ['Home adaptations'],
    description: 'Minor adaptations reduce risk and restore confidence; their timing matters.',
    plain: 'Small changes, like a rail or a shower chair, made home safer and calmer.',
    parent: 'Keeping watch at night',
  },
  {
    name: 'The carer’s own life',
    status: 'agreed',
    codes: ['Work and money', 'Losing myself', 'Anger and guilt'],
    description: 'Caring reshapes the carer’s work, finances, identity and emotions; mixed feelings are common and rarely voiced.',
    plain: 'Caring changed the carer’s own life. Work, money and time with friends were lost. Many felt angry, then guilty.',
  },
]

export async function seedDemoThemes(manager: EntityManager, study: Study, people: { coder1: string; partner: string }): Promise<void> {
  const codes: { id: string; label: string }[] = await manager.query(`SELECT id, label FROM codes WHERE study_id = $1`, [study.id])
  const codeId = new Map(codes.map((c) => [c.label, c.id]))
  const themeId = new Map<string, string>()
  let position = 0
  for (const t of THEMES) {
    const parentId = t.parent ? themeId.get(t.parent)! : null
    const theme = await manager.save(manager.create(Theme, { studyId: study.id, parentId, position: parentId ? 0 : position++, name: t.name, description: t.description, plainDescription: t.plain, status: t.status }))
    themeId.set(t.name, theme.id)
    const ids = t.codes.map((label) => codeId.get(label)!).filter(Boolean)
    await manager.insert(ThemeCode, ids.map((id) => ({ themeId: theme.id, codeId: id })))
    const supporting: { id: string }[] = await manager.query(
      `SELECT DISTINCT ON (e.participant_id) e.id FROM excerpts e JOIN excerpt_codes x ON x.excerpt_id = e.id
        WHERE x.code_id = ANY($1::uuid[]) AND e.coder_id = $2 ORDER BY e.participant_id, e.start_offset LIMIT 3`,
      [ids, people.coder1],
    )
    if (supporting.length) await manager.insert(ThemeExcerpt, supporting.map((e, i) => ({ themeId: theme.id, excerptId: e.id, shareWithPartners: true, position: i })))
  }
  const closesOn = new Date(Date.now() - 10 * 86_400_000).toISOString().slice(0, 10)
  const round = await manager.save(
    manager.create(ReviewRound, { studyId: study.id, title: 'First look at the themes', closesOn, status: 'closed', closedAt: new Date(), showCharacteristics: ['relationship'], message: 'Thank you for reading these early themes. There are no wrong answers.' }),
  )
  const inRound = ['Sent home in a hurry', 'Nobody to ask', 'The carer’s own life']
  await manager.insert(ReviewRoundTheme, inRound.map((name, i) => ({ roundId: round.id, themeId: themeId.get(name)!, themeName: name, position: i })))
  const submittedAt = new Date(Date.now() - 12 * 86_400_000)
  await manager.insert(PartnerAnswer, [
    { roundId: round.id, themeId: themeId.get('Sent home in a hurry')!, partnerId: people.partner, verdict: 'rings_true', comment: 'This is exactly how it felt for us. The pharmacy wait was the worst part.', submittedAt, response: 'Thank you. We kept the theme as it is and used your words about the wait in our summary for the hospital.', respondedAt: new Date() },
    { roundId: round.id, themeId: themeId.get('Nobody to ask')!, partnerId: people.partner, verdict: 'something_missing', comment: 'Weekends and nights are missing. That is when there really is nobody.', note: 'Remember to mention the out-of-hours line.', shareNote: true, submittedAt, response: 'We went back to the interviews and added nights and weekends to this theme.', respondedAt: new Date() },
    { roundId: round.id, themeId: themeId.get('The carer’s own life')!, partnerId: people.partner, verdict: 'needs_discussion', comment: 'I am not sure anger and guilt belong together. Can we talk about it at the next meeting?', submittedAt },
  ])
}
