import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import Papa from 'papaparse'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { approvedTranscript } from '../support/interviews.js'
import { openRecruitment } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/** Reports and CSV exports: the demo study's known numbers, consent honoured in quotes, empty studies. */
let ctx: TestContext
let demoId: string
let lead: Client
let coder: Client
let coordinator: Client
beforeAll(async () => {
  ctx = await createTestContext()
  demoId = (await seedDemo(ctx.dataSource, 'test', undefined, ctx.storage)).studyId
  ;[lead, coder, coordinator] = [new Client(ctx.app), new Client(ctx.app), new Client(ctx.app)]
  await lead.signIn('lead@heardwell.test', DEMO_PASSWORD)
  await coder.signIn('coder1@heardwell.test', DEMO_PASSWORD)
  await coordinator.signIn('coordinator@heardwell.test', DEMO_PASSWORD)
})
afterAll(() => ctx?.close())

const demo = () => `/api/studies/${demoId}`
const parse = (csv: string) => Papa.parse<string[]>(csv.replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data

describe('reports on the demo study', () => {
  it('counts the recruitment flow as the seed made it: 21 enquiries, 13 interviews, one withdrawal', async () => {
    const flow = (await coder.get(`${demo()}/reports/recruitment-flow`)).body
    const count = Object.fromEntries(flow.stages.map((s: { key: string; count: number }) => [s.key, s.count]))
    expect(count).toMatchObject({ enquired: 21, interviewed: 13, withdrawn: 1 })
    const summary = (await lead.get(`${demo()}/recruitment/summary`)).body
    expect(count.screened).toBe(summary.funnel.screened)
    expect(count.eligible).toBeGreaterThanOrEqual(count.consented)
    expect(count.consented).toBeGreaterThanOrEqual(count.interviewed)
    expect(flow.exits.map((e: { reason: string }) => e.reason)).toContain('Looking for help with their own care')
    const csv = parse((await coder.get(`${demo()}/exports/recruitment-flow.csv`)).text)
    expect(csv[0]).toEqual(['row', 'stage', 'reason', 'count'])
    expect(csv.find((r) => r[0] === 'stage' && r[1] === 'Enquired')![3]).toBe('21')
  })

  it('tabulates characteristics of the 13 interviewed with small cells suppressed, and counts everyone when told to', async () => {
    const suppressed = (await coder.get(`${demo()}/reports/characteristics?minCell=5`)).body
    expect(suppressed.totals.interviewed).toBe(13)
    const cells = suppressed.groups.flatMap((g: { rows: { interviewed: { count: number | null; suppressed: boolean } }[] }) => g.rows.map((r) => r.interviewed))
    expect(cells.some((c: { suppressed: boolean }) => c.suppressed)).toBe(true)
    expect(cells.every((c: { count: number | null; suppressed: boolean }) => c.suppressed || c.count === 0 || c.count! >= 5)).toBe(true)
    const all = (await coder.get(`${demo()}/reports/characteristics?minCell=1`)).body
    for (const g of all.groups) expect(g.rows.reduce((sum: number, r: { interviewed: { count: number } }) => sum + r.interviewed.count, 0)).toBe(13)
    expect(all.duration).toMatchObject({ n: 13 })
    expect(JSON.stringify(all)).not.toMatch(/NaN/)
    const csv = parse((await coder.get(`${demo()}/exports/characteristics.csv?minCell=5`)).text)
    expect(csv[0]).toEqual(['characteristic', 'value', 'interviewed_n', 'interviewed_percent', 'consented_n', 'consented_percent'])
    expect(csv.some((r) => r[2] === '<5')).toBe(true)
  })

  it('keeps the reporting checklists: COREQ 32 items, SRQR 21; coordinators fill them in, coders read', async () => {
    expect((await coder.get(`${demo()}/reports/checklists/coreq`)).body).toMatchObject({ total: 32, done: 0 })
    expect((await coder.get(`${demo()}/reports/checklists/srqr`)).body.total).toBe(21)
    expect((await coder.put(`${demo()}/reports/checklists/coreq/items/12`, { where: 'Results, first paragraph', note: '', done: true })).status).toBe(403)
    const saved = await coordinator.put(`${demo()}/reports/checklists/coreq/items/12`, { where: 'Results, first paragraph', note: 'Thirteen carers', done: true })
    expect(saved.body).toMatchObject({ done: 1 })
    expect(saved.body.items.find((i: { number: string }) => i.number === '12')).toMatchObject({ where: 'Results, first paragraph', done: true })
    expect((await coordinator.put(`${demo()}/reports/checklists/coreq/items/99`, { where: '', note: '', done: true })).status).toBe(404)
    const csv = parse((await coder.get(`${demo()}/exports/coreq.csv`)).text)
    expect(csv).toHaveLength(33)
  })

  it('writes a methods summary from the study’s own facts', async () => {
    const methods = (await coder.get(`${demo()}/reports/methods-summary`)).body
    expect(methods.facts).toMatchObject({ interviews: 13, coders: 2, reviewRounds: 1 })
    expect(methods.paragraphs.join(' ')).toMatch(/13/)
    expect(methods.paragraphs.join(' ')).toMatch(/Guest, Namey & Chen \(2020\)/)
    expect(JSON.stringify(methods)).not.toMatch(/NaN|undefined/)
  })

  it('lets only the lead download the audit trail, and records that they did', async () => {
    expect((await coder.get(`${demo()}/exports/audit.csv`)).status).toBe(403)
    const res = await lead.get(`${demo()}/exports/audit.csv?bom=1`)
    expect(res.status).toBe(200)
    expect(res.text.startsWith('\uFEFF')).toBe(true)
    expect(parse(res.text)[0]).toEqual(['at', 'actor', 'action', 'target_type', 'target_id', 'ip', 'details'])
    const [row] = await ctx.dataSource.query(`SELECT count(*)::int AS n FROM audit_events WHERE study_id = $1 AND action = 'audit.exported'`, [demoId])
    expect(row.n).toBe(1)
  })
})

describe('quotes by theme', () => {
  it('round-trips commas, quotes, new lines and non-Latin text, and leaves out declined quotation and withdrawn data (counts only)', async () => {
    const team = await makeTeam(ctx.dataSource)
    const [tLead, tCoord, tCoder] = [new Client(ctx.app), new Client(ctx.app), new Client(ctx.app)]
    await tLead.signIn(team.users.lead.email, TEST_PASSWORD)
    await tCoord.signIn(team.users.coordinator.email, TEST_PASSWORD)
    await tCoder.signIn(team.users.coder.email, TEST_PASSWORD)
    await openRecruitment(tLead, team.study.id)
    const base = `/api/studies/${team.study.id}`
    const said = 'He said, "we are home", and then: 東京の兄が電話をくれた; Σπίτι =1+1'
    const quotable = await approvedTranscript(tCoord, tLead, team.study.id, 'Ada Quote', uniqueEmail('ada'), `Interviewer: And then?\nP: ${said}`)
    const declined = await approvedTranscript(tCoord, tLead, team.study.id, 'Ben Private', uniqueEmail('ben'), 'Interviewer: And then?\nP: Nobody may quote this line.', { audio_recording: true, direct_quotes: false, future_contact: false })
    const code = (await tCoder.post(`${base}/codes`, { label: 'Home' })).body.id
    const ids: string[] = []
    for (const t of [quotable, declined]) {
      const reading = (await tCoder.get(`${base}/transcripts/${t.transcriptId}`)).body
      const { start, end } = reading.turns.at(-1)
      ids.push((await tCoder.post(`${base}/transcripts/${t.transcriptId}/excerpts`, { start, end, text: reading.text.slice(start, end), codeIds: [code] })).body.id)
    }
    expect((await tLead.post(`${base}/themes`, { name: 'Coming home, "at last"', plainDescription: 'Home at last.', codeIds: [code], excerpts: ids.map((excerptId) => ({ excerptId, shareWithPartners: false })) })).status).toBe(201)

    const report = (await tCoder.get(`${base}/reports/quotes-by-theme`)).body
    expect(report.themes[0].quotes.map((q: { text: string }) => q.text)).toEqual([said])
    expect(report.leftOut).toEqual({ declinedQuotation: 1, withdrawn: 0 })
    const csv = (await tCoder.get(`${base}/exports/quotes-by-theme.csv?bom=1`)).text
    expect(csv.startsWith('\uFEFF')).toBe(true)
    const rows = parse(csv)
    expect(rows[0]).toEqual(['theme', 'theme_status', 'pseudonym', 'characteristics', 'quote'])
    expect(rows[1]![0]).toBe('Coming home, "at last"')
    expect(rows[1]![4]).toBe(said) // commas, quotes and non-Latin text survive; "=1+1" is not at the start so stays as written
    expect(rows.map((r) => r[4]).join(' ')).not.toContain('Nobody may quote')
    expect(rows.at(-2)).toEqual(['(left out, counts only)', '', '', 'participant did not agree to be quoted', '1 excerpt'])

    await tCoord.post(`${base}/participants/${quotable.participantId}/withdrawal`, { scope: 'withdraw_data', effectiveDate: new Date().toISOString().slice(0, 10), reason: 'Changed their mind' })
    const after = (await tCoder.get(`${base}/reports/quotes-by-theme`)).body
    expect(after.themes[0].quotes).toEqual([])
    expect(after.leftOut).toEqual({ declinedQuotation: 1, withdrawn: 1 })
  })
})

describe('an empty study', () => {
  it('gives sensible reports and CSVs, never errors', async () => {
    const team = await makeTeam(ctx.dataSource)
    const emptyLead = new Client(ctx.app)
    await emptyLead.signIn(team.users.lead.email, TEST_PASSWORD)
    const base = `/api/studies/${team.study.id}`
    for (const path of ['reports/characteristics', 'reports/recruitment-flow', 'reports/quotes-by-theme', 'reports/checklists/srqr', 'reports/methods-summary']) {
      const res = await emptyLead.get(`${base}/${path}`)
      expect(res.status, path).toBe(200)
      expect(JSON.stringify(res.body), path).not.toMatch(/NaN|undefined/)
    }
    for (const name of ['characteristics', 'recruitment-flow', 'quotes-by-theme', 'codebook', 'coreq', 'srqr', 'audit']) {
      const res = await emptyLead.get(`${base}/exports/${name}.csv`)
      expect(res.status, name).toBe(200)
      expect(res.headers['content-type']).toMatch(/text\/csv/)
    }
    expect((await emptyLead.get(`${base}/reports/methods-summary`)).body.paragraphs.join(' ')).toMatch(/No interviews/)
  })
})
