import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/** The demo study `npm start` loads: a realistic funnel and consent picture (invented data). */
let ctx: TestContext
let studyId: string
let lead: Client
beforeAll(async () => {
  ctx = await createTestContext()
  studyId = (await seedDemo(ctx.dataSource, 'test', undefined, ctx.storage)).studyId
  lead = new Client(ctx.app)
  await lead.signIn('lead@heardwell.test', DEMO_PASSWORD)
})
afterAll(() => ctx?.close())

describe('demo study', () => {
  it('loads once: a second run changes nothing', async () => {
    const before = await ctx.dataSource.query('SELECT (SELECT count(*) FROM participants) AS p, (SELECT count(*) FROM consent_records) AS c, (SELECT count(*) FROM users) AS u')
    await seedDemo(ctx.dataSource, 'test', undefined, ctx.storage)
    expect(await ctx.dataSource.query('SELECT (SELECT count(*) FROM participants) AS p, (SELECT count(*) FROM consent_records) AS c, (SELECT count(*) FROM users) AS u')).toEqual(before)
    await expect(seedDemo(ctx.dataSource, 'production')).rejects.toThrow(/Refusing/)
  })

  it('shows a realistic recruitment funnel', async () => {
    const { funnel, notEnrolledReasons } = (await lead.get(`/api/studies/${studyId}/recruitment/summary`)).body
    expect(funnel.enquired).toBe(21)
    expect(funnel.notEligible).toBe(4)
    expect(funnel.awaitingReview).toBe(1)
    expect(notEnrolledReasons.map((r: { reason: string }) => r.reason)).toContain('Looking for help with their own care')
  })

  it('has two form versions, people on each, one in the re-consent queue and one withdrawal with data removed', async () => {
    const summary = (await lead.get(`/api/studies/${studyId}/consent/summary`)).body
    expect(summary.perVersion.map((v: { label: string; status: string }) => [v.label, v.status])).toEqual([['v1.0', 'superseded'], ['v2.0', 'approved']])
    expect(summary.perVersion.every((v: { consented: number }) => v.consented > 0)).toBe(true)
    expect(summary.reconsentQueue.map((q: { pseudonym: string }) => q.pseudonym)).toEqual(['P01'])
    expect(summary.withdrawals).toEqual([expect.objectContaining({ pseudonym: 'P08', scope: 'withdraw_data', dataRemoved: true })])
    expect(summary.waitingLinks.map((l: { pseudonym: string }) => l.pseudonym)).toEqual(['P09'])
    const forms = (await lead.get(`/api/studies/${studyId}/consent-forms`)).body.forms
    const file = await lead.get(`/api/studies/${studyId}/consent-forms/${forms[0].id}/file`)
    expect(file.status).toBe(200)
  })

  it('has interviews in at least three time zones and a dozen approved transcripts, the withdrawn one excluded', async () => {
    const interviews = (await lead.get(`/api/studies/${studyId}/interviews`)).body.interviews
    const zones = new Set(interviews.flatMap((i: { participantTimeZone: string; interviewerTimeZone: string }) => [i.participantTimeZone, i.interviewerTimeZone]))
    expect(zones.size).toBeGreaterThanOrEqual(3)
    const coder = new Client(ctx.app)
    await coder.signIn('coder1@heardwell.test', DEMO_PASSWORD)
    const transcripts = (await coder.get(`/api/studies/${studyId}/transcripts`)).body.transcripts
    expect(transcripts).toHaveLength(12)
    expect(transcripts.some((t: { pseudonym: string }) => t.pseudonym === 'P08')).toBe(false)
    const reading = (await coder.get(`/api/studies/${studyId}/transcripts/${transcripts[0].id}`)).body
    expect(reading.turns.length).toBe(12)
    for (const turn of reading.turns) expect(reading.text.slice(turn.start, turn.end).trim().length).toBeGreaterThan(10)
  })

  it('has a codebook of about twenty codes and two coders’ coding on several transcripts, withdrawn data left out', async () => {
    const codes = (await lead.get(`/api/studies/${studyId}/codes`)).body.codes as { label: string; parentId: string | null; excerptCount: number; example: unknown }[]
    expect(codes.length).toBeGreaterThanOrEqual(18)
    expect(codes.length).toBeLessThanOrEqual(26)
    expect(codes.filter((c) => c.parentId === null).length).toBeGreaterThan(3)
    expect(codes.filter((c) => c.example).length).toBeGreaterThan(5)
    const transcripts = (await lead.get(`/api/studies/${studyId}/transcripts`)).body.transcripts as { id: string; pseudonym: string }[]
    const coders = new Map<string, number>()
    for (const t of transcripts.filter((x) => x.pseudonym !== 'P08')) {
      const list = (await lead.get(`/api/studies/${studyId}/transcripts/${t.id}/excerpts`)).body
      for (const c of list.coders) coders.set(c.name, (coders.get(c.name) ?? 0) + 1)
    }
    expect([...coders.values()].filter((n) => n >= 3)).toHaveLength(2) // both coders coded at least three transcripts
    const matrix = (await lead.get(`/api/studies/${studyId}/matrices/code-participant`)).body
    expect(matrix.excluded).toBeGreaterThan(0) // P08's excerpts are kept but never counted
    expect(matrix.participants.map((p: { pseudonym: string }) => p.pseudonym)).not.toContain('P08')
    expect((await lead.get(`/api/studies/${studyId}/memos`)).body.memos.length).toBeGreaterThanOrEqual(3)
    expect((await lead.get(`/api/studies/${studyId}/codebook/snapshots`)).body.snapshots).toHaveLength(1)
  })

  it('has themes in each status and one closed review round with the partner’s answers and the team’s responses', async () => {
    const themes = (await lead.get(`/api/studies/${studyId}/themes`)).body.themes as { status: string; parentId: string | null; support: { excerpts: number } }[]
    expect(new Set(themes.map((t) => t.status))).toEqual(new Set(['draft', 'with_partners', 'agreed']))
    expect(themes.some((t) => t.parentId)).toBe(true)
    expect(themes.every((t) => t.support.excerpts > 0)).toBe(true)
    const rounds = (await lead.get(`/api/studies/${studyId}/review-rounds`)).body.rounds
    expect(rounds).toEqual([expect.objectContaining({ status: 'closed', partnersDone: 1, themeCount: 3 })])
    const detail = (await lead.get(`/api/studies/${studyId}/review-rounds/${rounds[0].id}`)).body
    expect(detail.answers).toHaveLength(3)
    expect(detail.answers.filter((a: { response: string }) => a.response)).toHaveLength(2)
    const partner = new Client(ctx.app)
    await partner.signIn('partner@heardwell.test', DEMO_PASSWORD)
    const seen = (await partner.get(`/api/studies/${studyId}/partner/rounds/${rounds[0].id}`)).body
    expect(seen.themes.some((t: { quotes: unknown[] }) => t.quotes.length > 0)).toBe(true)
    expect(JSON.stringify(seen)).not.toContain('P08') // withdrawn data never reaches a partner
  })
})
