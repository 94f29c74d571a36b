import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { makeTeam, TEST_PASSWORD } from '../support/factories.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/** Agreement and saturation through the API, on the demo study's two coders (invented data). */
let ctx: TestContext
let studyId: string
let lead: Client
let coder: Client
beforeAll(async () => {
  ctx = await createTestContext()
  studyId = (await seedDemo(ctx.dataSource, 'test', undefined, ctx.storage)).studyId
  lead = new Client(ctx.app)
  coder = new Client(ctx.app)
  await lead.signIn('lead@heardwell.test', DEMO_PASSWORD)
  await coder.signIn('coder2@heardwell.test', DEMO_PASSWORD)
})
afterAll(() => ctx?.close())

const base = () => `/api/studies/${studyId}`
type Row = { label: string; percentAgreement: number | null; kappa: { value: number | null; band?: { source: string }; reason?: string } | null; alpha: { value: number | null; band?: { label: string; source: string }; reason?: string } }

describe('inter-coder agreement', () => {
  it('shows per-code agreement on the demo with some codes clearly weaker than others, each band with its source', async () => {
    const res = await lead.get(`${base()}/agreement`)
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200)
    expect(res.body).toMatchObject({ enabled: true, unit: 'turn', emptyReason: null })
    expect(res.body.coders.map((c: { name: string }) => c.name).sort()).toEqual(['Jun Halvard', 'Priya Salden'])
    expect(res.body.transcripts.length).toBeGreaterThanOrEqual(5)
    expect(res.body.transcripts.map((t: { pseudonym: string }) => t.pseudonym)).not.toContain('P08') // withdrawn data never counts
    const rows = res.body.perCode as Row[]
    if (process.env.SHOW_AGREEMENT) console.log(rows.map((r) => `${r.label}: ${r.alpha.value ?? r.alpha.reason}`).join('\n'))
    const alphas = rows.map((r) => r.alpha.value).filter((v): v is number => v !== null)
    expect(Math.max(...alphas)).toBeGreaterThanOrEqual(0.8)
    expect(Math.min(...alphas)).toBeLessThan(0.667)
    const anger = rows.find((r) => r.label === 'Anger and guilt')!
    const stairs = rows.find((r) => r.label === 'Stairs and bathroom')!
    expect(anger.alpha.value!).toBeLessThan(stairs.alpha.value!)
    expect(stairs.alpha.band!.source).toMatch(/Krippendorff \(2004\)/)
    expect(stairs.kappa!.band!.source).toMatch(/Landis & Koch \(1977\)/)
    expect(JSON.stringify(res.body)).not.toMatch(/NaN/)
    const unused = rows.find((r) => r.label === 'Leaving hospital')! // a parent code nobody applied
    expect(unused.alpha).toMatchObject({ value: null, reason: expect.any(String) })
    expect(res.body.disagreementCount).toBeGreaterThan(0)
    const reading = (await lead.get(`${base()}/transcripts/${res.body.disagreements[0].transcriptId}`)).body.text as string
    const d = res.body.disagreements[0]
    expect(reading.slice(d.start, d.end).startsWith(d.text)).toBe(true)
  })

  it('compares sentences when the lead chooses them; reflexive teams switch agreement off', async () => {
    const turns = (await lead.get(`${base()}/agreement`)).body.units
    expect((await coder.put(`${base()}/analysis-settings`, { agreementEnabled: true, agreementUnit: 'sentence' })).status).toBe(403)
    expect((await lead.put(`${base()}/analysis-settings`, { agreementEnabled: true, agreementUnit: 'sentence' })).body).toEqual({ agreementEnabled: true, agreementUnit: 'sentence' })
    const sentences = (await lead.get(`${base()}/agreement`)).body
    expect(sentences.unit).toBe('sentence')
    expect(sentences.units).toBeGreaterThan(turns)
    await lead.put(`${base()}/analysis-settings`, { agreementEnabled: false, agreementUnit: 'turn' })
    const off = (await lead.get(`${base()}/agreement`)).body
    expect(off).toMatchObject({ enabled: false, perCode: [], overall: null, emptyReason: expect.stringMatching(/switched off/) })
    await lead.put(`${base()}/analysis-settings`, { agreementEnabled: true, agreementUnit: 'turn' })
  })

  it('shows coders agreement only while the study allows comparison', async () => {
    expect((await coder.get(`${base()}/agreement`)).status).toBe(200)
    await lead.put(`${base()}/coding-settings`, { coderComparison: false })
    const refused = await coder.get(`${base()}/agreement`)
    expect(refused.status).toBe(200)
    expect(refused.body).toMatchObject({ perCode: [], disagreements: [], overall: null, emptyReason: expect.stringMatching(/lead only/) })
    await lead.put(`${base()}/coding-settings`, { coderComparison: true })
  })

  it('explains an empty study and a single coder instead of failing', async () => {
    const team = await makeTeam(ctx.dataSource)
    const empty = new Client(ctx.app)
    await empty.signIn(team.users.lead.email, TEST_PASSWORD)
    const res = await empty.get(`/api/studies/${team.study.id}/agreement`)
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ perCode: [], overall: null, emptyReason: expect.stringMatching(/Nothing has been coded yet/) })
    const one = await lead.get(`${base()}/agreement?coderIds=${res.body.coders[0]?.id ?? (await lead.get(`${base()}/agreement`)).body.coders[0].id}`)
    expect(one.body.emptyReason).toMatch(/at least two coders/)
    const saturation = await empty.get(`/api/studies/${team.study.id}/saturation`)
    expect(saturation.body).toMatchObject({ status: 'too-few-interviews', reached: false, interviews: [] })
    expect(JSON.stringify(saturation.body)).not.toMatch(/NaN/)
  })
})

describe('saturation', () => {
  it('lists new codes per coded interview in interview order and applies the stopping rule (Guest, Namey & Chen 2020)', async () => {
    const res = await coder.get(`${base()}/saturation`)
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200)
    const { interviews, params } = res.body
    expect(params).toEqual({ baseSize: 4, runLength: 2, threshold: 0.05 })
    expect(interviews.map((i: { pseudonym: string }) => i.pseudonym)).not.toContain('P08')
    const dates = interviews.map((i: { interviewDate: string }) => i.interviewDate)
    expect(dates).toEqual([...dates].sort())
    const news = interviews.map((i: { newCodes: number }) => i.newCodes)
    expect(interviews.at(-1).cumulative).toBe(news.reduce((a: number, b: number) => a + b, 0))
    expect(res.body.methodsSentence).toMatch(/Guest, Namey & Chen \(2020\)/)
    expect(res.body.citation).toMatch(/PLOS ONE 15\(5\): e0232076/)
    const strict = (await coder.get(`${base()}/saturation?baseSize=2&runLength=1&threshold=0`)).body
    expect(strict.params).toEqual({ baseSize: 2, runLength: 1, threshold: 0 })
    expect(strict.steps.length).toBe(interviews.length - 2)
    expect((await coder.get(`${base()}/saturation?threshold=2`)).status).toBe(400)
  })
})
