import Papa from 'papaparse'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_QUESTIONNAIRE } from '../../server/seed/demo-questionnaire.js'
import { makeTeam, TEST_PASSWORD } from '../support/factories.js'
import { ELIGIBLE_ANSWERS, openRecruitment, TOO_YOUNG_ANSWERS } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
const as: Record<'lead' | 'coordinator' | 'coder' | 'partner', Client> = {} as never
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  for (const role of ['lead', 'coordinator', 'coder', 'partner'] as const) {
    as[role] = new Client(ctx.app)
    await as[role].signIn(team.users[role].email, TEST_PASSWORD)
  }
  await openRecruitment(as.lead, team.study.id)
})
afterAll(() => ctx?.close())

const base = () => `/api/studies/${team.study.id}`

async function logEnquiry(name: string, answers?: object, source = 'phone') {
  const res = await as.coordinator.post(`${base()}/participants`, {
    contact: { name, email: '', phone: '+44 20 7946 0000', country: 'United Kingdom', timeZone: 'Europe/London' },
    source,
    sourceDetail: 'Rang the study line',
    answers,
  })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body
}

describe('screening questionnaire versions', () => {
  it('edits in place while unused, and saves a new version once it has screenings', async () => {
    const before = (await as.lead.get(`${base()}/screening-form`)).body
    expect(before.version).toBe(1)
    const edited = { ...DEMO_QUESTIONNAIRE, intro: 'Edited before anyone answered.' }
    expect((await as.lead.put(`${base()}/screening-form`, edited)).body.version).toBe(1)
    await logEnquiry('Ada Versionson', ELIGIBLE_ANSWERS)
    const after = await as.lead.put(`${base()}/screening-form`, { ...edited, intro: 'Edited after a screening.' })
    expect(after.body.version).toBe(2)
    const versions = (await as.lead.get(`${base()}/screening-form/versions`)).body.versions
    expect(versions.map((v: { version: number; screeningCount: number }) => [v.version, v.screeningCount])).toEqual([[2, 0], [1, 1]])
  })

  it('refuses rules that do not fit the question, with the field named', async () => {
    const broken = structuredClone(DEMO_QUESTIONNAIRE)
    broken.questions[0]!.rule = { operator: 'is', value: 'not_an_option' }
    const res = await as.lead.put(`${base()}/screening-form`, broken)
    expect(res.status).toBe(400)
    expect(res.body.errors[0].path).toBe('questions.0.rule')
    expect((await as.coordinator.put(`${base()}/screening-form`, DEMO_QUESTIONNAIRE)).status).toBe(403)
  })
})

describe('participants', () => {
  it('the coordinator logs a phone screening; the outcome, characteristics and timeline follow', async () => {
    const detail = await logEnquiry('Bea Phoneham', ELIGIBLE_ANSWERS)
    expect(detail.pseudonym).toMatch(/^P\d{2}$/)
    expect(detail.status).toBe('eligible')
    expect(detail.characteristics).toEqual({ region: 'coast', relationship: 'adult_child' })
    expect(detail.contact.name).toBe('Bea Phoneham')
    expect(detail.timeline.map((e: { kind: string }) => e.kind)).toEqual(['enquiry', 'screening'])
    expect(detail.screenings[0].questionnaireVersion).toBe(2)
  })

  it('keeps the version each screening used when re-screening with a newer one', async () => {
    const first = await logEnquiry('Cy Rescreen', TOO_YOUNG_ANSWERS)
    expect(first.status).toBe('not_eligible')
    expect(first.screenings[0].result.failing[0]).toMatchObject({ questionId: 'age', kind: 'inclusion_not_met' })
    await as.lead.put(`${base()}/screening-form`, { ...DEMO_QUESTIONNAIRE, intro: 'Version three.' })
    const again = await as.coordinator.post(`${base()}/participants/${first.id}/screenings`, { answers: { ...TOO_YOUNG_ANSWERS, age: 18 }, note: 'Age misheard on the phone.' })
    expect(again.status).toBe(201)
    expect(again.body.status).toBe('eligible')
    expect(again.body.screenings.map((s: { questionnaireVersion: number }) => s.questionnaireVersion)).toEqual([3, 2])
  })

  it('an enquiry without answers is logged as enquired; incomplete staff answers need review', async () => {
    expect((await logEnquiry('Dee Later')).status).toBe('enquired')
    const partial = await logEnquiry('Eve Partial', { reason: 'take_part', age: 40 })
    expect(partial.status).toBe('screening')
    expect(partial.screenings[0].result.outcome).toBe('needs_review')
  })

  it('the lead overrides an outcome with a written reason, and it is audited; others may not', async () => {
    const p = await logEnquiry('Fay Override', TOO_YOUNG_ANSWERS)
    expect((await as.coordinator.post(`${base()}/participants/${p.id}/override`, { outcome: 'eligible', reason: 'x' })).status).toBe(403)
    expect((await as.lead.post(`${base()}/participants/${p.id}/override`, { outcome: 'eligible', reason: '' })).status).toBe(400)
    const res = await as.lead.post(`${base()}/participants/${p.id}/override`, { outcome: 'eligible', reason: 'Turns 18 before the interview date; ethics board agreed.' })
    expect(res.status).toBe(200)
    expect(res.body.status).toBe('eligible')
    expect(res.body.override).toMatchObject({ outcome: 'eligible', by: 'Lead Person' })
    expect(res.body.timeline.at(-1).kind).toBe('override')
    const [audit] = await ctx.dataSource.query(`SELECT details FROM audit_events WHERE action = 'participant.outcome_overridden' AND target_id = $1`, [p.id])
    expect(audit.details.reason).toMatch(/Turns 18/)
  })

  it('shows coders pseudonyms and characteristics only, and patient partners no records at all', async () => {
    const lead = await as.lead.get(`${base()}/participants?pageSize=100`)
    expect(lead.body.participants.every((p: { contact?: object }) => p.contact)).toBe(true)
    const coder = await as.coder.get(`${base()}/participants?pageSize=100`)
    expect(coder.status).toBe(200)
    expect(coder.body.total).toBe(lead.body.total)
    for (const row of coder.body.participants) {
      expect(Object.keys(row).sort()).toEqual(['characteristics', 'helpSeeking', 'id', 'lastActivityAt', 'pseudonym', 'source', 'status'])
    }
    // a coder cannot find people by name either
    expect((await as.coder.get(`${base()}/participants?search=Phoneham`)).body.total).toBe(0)
    expect((await as.lead.get(`${base()}/participants?search=Phoneham`)).body.total).toBe(1)
    expect((await as.coder.get(`${base()}/participants/${lead.body.participants[0].id}`)).status).toBe(403)
    expect((await as.partner.get(`${base()}/participants`)).status).toBe(403)
    const summary = await as.partner.get(`${base()}/recruitment/summary`)
    expect(summary.status).toBe(200)
    expect(JSON.stringify(summary.body)).not.toMatch(/Phoneham|P0\d/)
  })

  it('pages, filters and sorts on the server', async () => {
    const page1 = await as.lead.get(`${base()}/participants?page=1&pageSize=2&sortBy=pseudonym`)
    const page2 = await as.lead.get(`${base()}/participants?page=2&pageSize=2&sortBy=pseudonym`)
    expect(page1.body.participants.map((p: { pseudonym: string }) => p.pseudonym)).toEqual(['P01', 'P02'])
    expect(page2.body.participants[0].pseudonym).toBe('P03')
    const notEligible = await as.lead.get(`${base()}/participants?status=not_eligible`)
    expect(notEligible.body.participants.every((p: { status: string }) => p.status === 'not_eligible')).toBe(true)
    expect((await as.lead.get(`${base()}/participants?sortBy=name`)).status).toBe(400)
  })
})

describe('recruitment dashboard', () => {
  it('counts the funnel, reasons, sources and the sampling matrix', async () => {
    const res = await as.lead.get(`${base()}/recruitment/summary`)
    expect(res.status).toBe(200)
    const { funnel, notEnrolledReasons, sources, matrix } = res.body
    const all = (await as.lead.get(`${base()}/participants?pageSize=100`)).body.participants
    expect(funnel.enquired).toBe(all.length)
    expect(funnel.eligible).toBe(all.filter((p: { status: string }) => p.status === 'eligible').length)
    expect(funnel.notEligible).toBe(all.filter((p: { status: string }) => p.status === 'not_eligible').length)
    expect(sources).toEqual([{ source: 'phone', count: all.length }])
    const coastChild = matrix.find((m: { label: string }) => m.label === 'Region: Coast × Relationship to the patient: Adult child')
    expect(coastChild).toMatchObject({ target: 2 })
    expect(coastChild.enrolled).toBe(all.filter((p: { status: string; characteristics: Record<string, string> }) => p.status === 'eligible' && p.characteristics.region === 'coast' && p.characteristics.relationship === 'adult_child').length)
    expect(Array.isArray(notEnrolledReasons)).toBe(true)
  })
})

describe('screening log export', () => {
  it('round-trips commas, quotes, newlines and non-Latin names, neutralises formulas, and keeps contacts out by default', async () => {
    await logEnquiry('Zoë "Zed" Ōtsuka, 王秀英', ELIGIBLE_ANSWERS, 'other')
    const p = await logEnquiry('=HYPERLINK("x")', ELIGIBLE_ANSWERS)
    await as.lead.post(`${base()}/participants/${p.id}/override`, { outcome: 'not_eligible', reason: 'Moved away, "abroad",\nno longer reachable' })

    const plain = await as.coordinator.get(`${base()}/exports/screening-log.csv`).buffer(true).parse((res, cb) => {
      let data = ''
      res.on('data', (c: Buffer) => (data += c.toString('utf8')))
      res.on('end', () => cb(null, data))
    })
    expect(plain.status).toBe(200)
    expect(plain.headers['content-type']).toBe('text/csv; charset=utf-8')
    expect(plain.headers['content-disposition']).toMatch(/^attachment; filename="screening-log-T[0-9A-F]+-\d{4}-\d{2}-\d{2}\.csv"/)
    const text = (plain.body as string).replace(/^\uFEFF/, '')
    expect(text).not.toMatch(/Ōtsuka|Phoneham/)
    const rows = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data
    expect(rows.find((r) => r.pseudonym === p.pseudonym)?.override_reason).toBe('Moved away, "abroad",\nno longer reachable')

    expect((await as.coordinator.get(`${base()}/exports/screening-log.csv?contacts=true`)).status).toBe(403)
    const withContacts = await as.lead.get(`${base()}/exports/screening-log.csv?contacts=true`).buffer(true).parse((res, cb) => {
      let data = ''
      res.on('data', (c: Buffer) => (data += c.toString('utf8')))
      res.on('end', () => cb(null, data))
    })
    const contactRows = Papa.parse<Record<string, string>>((withContacts.body as string).replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true }).data
    expect(contactRows.map((r) => r.name)).toContain('Zoë "Zed" Ōtsuka, 王秀英')
    expect(contactRows.map((r) => r.name)).toContain(`'=HYPERLINK("x")`)
    const audits = await ctx.dataSource.query(`SELECT details FROM audit_events WHERE action = 'export.screening_log' ORDER BY id`)
    expect(audits.map((a: { details: { contacts: boolean } }) => a.details.contacts)).toEqual([false, true])
    expect((await as.coder.get(`${base()}/exports/screening-log.csv`)).status).toBe(403)
  })
})
