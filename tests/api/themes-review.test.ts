import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createLogger } from '../../server/lib/logger.js'
import { AuditService } from '../../server/modules/audit/audit.service.js'
import { MailService } from '../../server/modules/mail/mail.service.js'
import { ReviewRoundService } from '../../server/modules/themes/review-round.service.js'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { approvedTranscript } from '../support/interviews.js'
import { waitForMail } from '../support/mailbox.js'
import { openRecruitment } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * Themes and patient partner review through the API. The consent policy decides at every exit a
 * partner can reach: an excerpt of a participant who declined quotation, or who withdrew their data,
 * never reaches a partner, whatever the lead chose. Every word here is invented.
 */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
let coordinator: Client
let coder: Client
let partner: Client
let quotable: { participantId: string; transcriptId: string }
let private_: { participantId: string; transcriptId: string }
let codeId: string
let themeId: string
let otherThemeId: string
let roundId: string
const base = () => `/api/studies/${team.study.id}`
const tomorrow = () => new Date(Date.now() + 86_400_000).toISOString().slice(0, 10)
const yesterday = () => new Date(Date.now() - 86_400_000).toISOString().slice(0, 10)

beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  ;[lead, coordinator, coder, partner] = [new Client(ctx.app), new Client(ctx.app), new Client(ctx.app), new Client(ctx.app)]
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
  await coordinator.signIn(team.users.coordinator.email, TEST_PASSWORD)
  await coder.signIn(team.users.coder.email, TEST_PASSWORD)
  await partner.signIn(team.users.partner.email, TEST_PASSWORD)
  await openRecruitment(lead, team.study.id)
  await ctx.startMailWorker()
  quotable = await approvedTranscript(coordinator, lead, team.study.id, 'Quinn Quotable', uniqueEmail('quinn'), 'Interviewer: How was it?\nP: The nights were the worst, I lay awake listening to him breathe.')
  private_ = await approvedTranscript(coordinator, lead, team.study.id, 'Pat Private', uniqueEmail('pat'), 'Interviewer: How was it?\nP: I never slept, every noise woke me in a panic.', { audio_recording: true, direct_quotes: false, future_contact: false })
  codeId = (await coder.post(`${base()}/codes`, { label: 'Sleepless nights' })).body.id
  for (const t of [quotable, private_]) {
    const reading = (await coder.get(`${base()}/transcripts/${t.transcriptId}`)).body as { text: string; turns: { start: number; end: number }[] }
    const { start, end } = reading.turns.at(-1)! // the participant's answer
    const res = await coder.post(`${base()}/transcripts/${t.transcriptId}/excerpts`, { start, end, text: reading.text.slice(start, end), codeIds: [codeId] })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
  }
})
afterAll(() => ctx?.close())

describe('themes', () => {
  it('the lead builds a theme from codes and chosen excerpts; consent decides which could ever reach partners', async () => {
    const excerpts = (await lead.get(`${base()}/excerpts?codeId=${codeId}`)).body.excerpts as { id: string; text: string }[]
    const res = await lead.post(`${base()}/themes`, {
      name: 'Nights on watch',
      description: 'Carers describe hypervigilance at night in the first weeks.',
      plainDescription: 'Many carers could not sleep. They stayed awake to keep watch.',
      codeIds: [codeId],
      excerpts: excerpts.map((e) => ({ excerptId: e.id, shareWithPartners: true })),
    })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    themeId = res.body.id
    expect(res.body).toMatchObject({ status: 'draft', codeIds: [codeId], support: { participants: 2, excerpts: 2 }, plainGrade: expect.any(Number) })
    const mayShow = Object.fromEntries(res.body.excerpts.map((e: { text: string; mayShowPartners: boolean }) => [e.text.slice(0, 12), e.mayShowPartners]))
    expect(mayShow).toEqual({ 'The nights w': true, 'I never slep': false })
    otherThemeId = (await lead.post(`${base()}/themes`, { name: 'Asking for help', plainDescription: 'Some carers found it hard to ask for help.', parentId: themeId })).body.id
    expect((await coder.get(`${base()}/themes`)).body.themes).toHaveLength(2)
    expect((await coder.post(`${base()}/themes`, { name: 'Not mine' })).status).toBe(403)
    const stale = await lead.patch(`${base()}/themes/${themeId}`, { version: 99, name: 'x' })
    expect(stale.status).toBe(409)
    const cycle = await lead.put(`${base()}/themes/order`, { order: [{ id: themeId, parentId: otherThemeId, position: 0 }, { id: otherThemeId, parentId: themeId, position: 0 }] })
    expect(cycle.status).toBe(422)
  })
})

describe('a review round', () => {
  it('refuses a round with no themes, a closing date in the past, or a theme with no plain-language description', async () => {
    expect((await lead.post(`${base()}/review-rounds`, { title: 'Empty', themeIds: [], closesOn: tomorrow() })).status).toBe(400)
    const past = await lead.post(`${base()}/review-rounds`, { title: 'Late', themeIds: [themeId], closesOn: yesterday() })
    expect(past.status).toBe(422)
    expect(past.body.detail).toMatch(/after today/)
    const bare = (await lead.post(`${base()}/themes`, { name: 'No words yet' })).body.id
    const noPlain = await lead.post(`${base()}/review-rounds`, { title: 'Bare', themeIds: [bare], closesOn: tomorrow() })
    expect(noPlain.status).toBe(422)
    expect(noPlain.body.detail).toMatch(/plain-language description/)
  })

  it('opens a round: the partner is e-mailed, reads only what consent allows, saves a draft and sends answers; the lead responds', async () => {
    const opened = await lead.post(`${base()}/review-rounds`, { title: 'First themes', themeIds: [themeId, otherThemeId], closesOn: tomorrow(), showCharacteristics: ['region', 'relationship'], message: 'Thank you for reading.' })
    expect(opened.status, JSON.stringify(opened.body)).toBe(201)
    roundId = opened.body.id
    const mail = await waitForMail(team.users.partner.email, /Themes to read/)
    expect(mail.text).toContain(`/studies/${team.study.id}/review/${roundId}`)
    expect(mail.text).not.toMatch(/nights|slept/i) // no study data in e-mail

    const round = (await partner.get(`${base()}/partner/rounds/${roundId}`)).body
    const theme = round.themes.find((t: { id: string }) => t.id === themeId)
    expect(theme.plainDescription).toMatch(/could not sleep/)
    expect(theme.quotes).toHaveLength(1) // the participant who declined quotation never appears
    expect(theme.quotes[0].text).toMatch(/^The nights were the worst/)
    expect(theme.quotes[0].pseudonym).toMatch(/^P\d+$/)
    expect(theme.quotes[0].characteristics.map((c: { label: string }) => c.label).length).toBeGreaterThan(0)
    expect(JSON.stringify(round)).not.toMatch(/I never slept|Quinn|Pat Private|@/)
    expect(JSON.stringify(round)).not.toMatch(/hypervigilance/) // the analytic description stays with the team

    expect((await partner.put(`${base()}/partner/rounds/${roundId}/themes/${themeId}`, { verdict: null, comment: 'half done', submit: true })).status).toBe(400)
    const draft = await partner.put(`${base()}/partner/rounds/${roundId}/themes/${themeId}`, { verdict: 'rings_true', comment: 'Draft words', note: 'my own thought', submit: false })
    expect(draft.status).toBe(200)
    expect(draft.body.answer).toMatchObject({ verdict: 'rings_true', submittedAt: null, note: 'my own thought' })
    expect((await lead.get(`${base()}/review-rounds/${roundId}`)).body.answers).toEqual([]) // drafts stay with the partner
    await partner.put(`${base()}/partner/rounds/${roundId}/themes/${themeId}`, { verdict: 'rings_true', comment: 'Yes, exactly how it was.', note: 'private', shareNote: false, submit: true })
    await partner.put(`${base()}/partner/rounds/${roundId}/themes/${otherThemeId}`, { verdict: 'something_missing', comment: 'Nobody offered help at night.', note: 'share this', shareNote: true, submit: true })
    const detail = (await lead.get(`${base()}/review-rounds/${roundId}`)).body
    expect(detail.answers).toHaveLength(2)
    const missing = detail.answers.find((a: { themeId: string }) => a.themeId === otherThemeId)
    expect(missing).toMatchObject({ verdict: 'something_missing', sharedNote: 'share this' })
    expect(detail.answers.find((a: { themeId: string }) => a.themeId === themeId).sharedNote).toBeNull() // private notes stay private
    expect(detail).toMatchObject({ partners: 1, partnersDone: 1, status: 'open' })
    await lead.put(`${base()}/review-rounds/${roundId}/answers/${missing.id}/response`, { response: 'We added night-time support to the theme.' })
    const seen = (await partner.get(`${base()}/partner/rounds/${roundId}`)).body.themes.find((t: { id: string }) => t.id === otherThemeId)
    expect(seen.answer.response).toBe('We added night-time support to the theme.')
    const themes = (await lead.get(`${base()}/themes`)).body.themes
    expect(themes.find((t: { id: string }) => t.id === themeId).status).toBe('with_partners')
  })

  it('reminds the partners who have not answered every theme, and nobody else', async () => {
    const second = await lead.post(`${base()}/review-rounds`, { title: 'Reminder check', themeIds: [themeId], closesOn: tomorrow() })
    expect(second.status).toBe(201)
    await waitForMail(team.users.partner.email, /Themes to read/)
    const mail = new MailService(ctx.dataSource, ctx.boss, 'Heardwell <no-reply@heardwell.test>', createLogger('silent'))
    const service = new ReviewRoundService(ctx.dataSource, new AuditService(ctx.dataSource), mail, ctx.boss, 'http://127.0.0.1')
    expect(await service.remind(second.body.id)).toBe(1) // the partner has not answered yet
    await waitForMail(team.users.partner.email, /A reminder/)
    await partner.put(`${base()}/partner/rounds/${second.body.id}/themes/${themeId}`, { verdict: 'rings_true', comment: '', submit: true })
    expect(await service.remind(second.body.id)).toBe(0) // answered everything: no reminder
    await lead.post(`${base()}/review-rounds/${second.body.id}/close`)
  })

  it('stops showing a quote the moment its participant withdraws their data', async () => {
    const res = await coordinator.post(`${base()}/participants/${quotable.participantId}/withdrawal`, { scope: 'withdraw_data', effectiveDate: new Date().toISOString().slice(0, 10), reason: 'Changed their mind' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const theme = (await partner.get(`${base()}/partner/rounds/${roundId}`)).body.themes.find((t: { id: string }) => t.id === themeId)
    expect(theme.quotes).toEqual([])
  })

  it('refuses deleting a theme in an open round and answers after the round closed, keeping what partners wrote', async () => {
    const version = (await lead.get(`${base()}/themes`)).body.themes.find((t: { id: string }) => t.id === otherThemeId).version
    const refused = await lead.delete(`${base()}/themes/${otherThemeId}?version=${version}`)
    expect(refused.status).toBe(409)
    expect(refused.body.detail).toMatch(/open review round/)
    expect((await lead.post(`${base()}/review-rounds/${roundId}/close`)).body.status).toBe('closed')
    const late = await partner.put(`${base()}/partner/rounds/${roundId}/themes/${themeId}`, { verdict: 'needs_discussion', comment: 'One more thought', submit: true })
    expect(late.status).toBe(409)
    expect(late.body.detail).toMatch(/closed/)
    expect((await lead.delete(`${base()}/themes/${otherThemeId}?version=${version}`)).status).toBe(204)
    const after = (await lead.get(`${base()}/review-rounds/${roundId}`)).body
    expect(after.themes.find((t: { id: string }) => t.id === otherThemeId)).toMatchObject({ name: 'Asking for help', deleted: true })
    expect(after.answers).toHaveLength(2) // nothing a partner wrote is lost
    const mine = (await partner.get(`${base()}/partner/rounds/${roundId}`)).body.themes.find((t: { id: string }) => t.id === otherThemeId)
    expect(mine).toMatchObject({ name: 'Asking for help', answer: { comment: 'Nobody offered help at night.', response: 'We added night-time support to the theme.' } })
  })

  it('keeps patient partners away from transcripts, records, contacts, screening, consent and unshared excerpts', async () => {
    const p = quotable.participantId
    for (const path of [
      `${base()}/transcripts`,
      `${base()}/transcripts/${private_.transcriptId}`,
      `${base()}/transcripts/${private_.transcriptId}/excerpts`,
      `${base()}/excerpts?codeId=${codeId}`,
      `${base()}/participants`,
      `${base()}/participants/${p}`,
      `${base()}/participants/${p}/consent`,
      `${base()}/consent/summary`,
      `${base()}/screening-form`,
      `${base()}/themes`,
      `${base()}/review-rounds`,
      `${base()}/search?q=nights`,
      `${base()}/memos`,
    ]) {
      expect((await partner.get(path)).status, path).toBe(403)
    }
    expect((await coder.get(`${base()}/partner/rounds`)).status).toBe(403)
  })
})
