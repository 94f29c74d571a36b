import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { waitForMail } from '../support/mailbox.js'
import { ELIGIBLE_ANSWERS, HELP_SEEKING_ANSWERS, openRecruitment, TOO_YOUNG_ANSWERS } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
beforeAll(async () => {
  // a generous limit here; the limit itself is tested with its own app below
  ctx = await createTestContext({ PUBLIC_ENQUIRIES_PER_HOUR: '500' })
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
  await openRecruitment(lead, team.study.id)
  await ctx.startMailWorker()
})
afterAll(() => ctx?.close())

function enquiry(answers: object, email = uniqueEmail('public'), extra: object = {}) {
  return {
    answers,
    contact: { name: 'Sam Public', email, phone: '', country: 'Canada', timeZone: 'America/Vancouver' },
    consentToContact: true,
    ...extra,
  }
}

async function submit(body: object, app = ctx.app, code = team.study.code) {
  const client = new Client(app)
  await client.refreshCsrf()
  return client.post(`/api/public/studies/${code.toLowerCase()}/enquiries`, body)
}

describe('public study page', () => {
  it('shows the study, who can take part and the current questions without signing in', async () => {
    const res = await request(ctx.app).get(`/api/public/studies/${team.study.code}`)
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ code: team.study.code, recruiting: true })
    expect(res.body.questionnaire.questions.map((q: { id: string }) => q.id)).toContain('age')
    expect(JSON.stringify(res.body)).not.toMatch(/@|lead/i)
    expect((await request(ctx.app).get('/api/public/studies/NOPE-123')).status).toBe(404)
  })

  it('answers each outcome kindly and queues an acknowledgement without the answers in it', async () => {
    const eligibleEmail = uniqueEmail('eligible')
    const eligible = await submit(enquiry(ELIGIBLE_ANSWERS, eligibleEmail))
    expect(eligible.status).toBe(201)
    expect(eligible.body).toEqual({ outcome: 'eligible', studyTitle: team.study.title, resources: [] })

    const helpEmail = uniqueEmail('help')
    const help = await submit(enquiry(HELP_SEEKING_ANSWERS, helpEmail))
    expect(help.body.outcome).toBe('help_seeking')
    expect(help.body.resources.map((r: { title: string }) => r.title)).toContain('Regional stroke support line')

    const young = await submit(enquiry(TOO_YOUNG_ANSWERS))
    expect(young.body.outcome).toBe('not_eligible')

    const helpMail = await waitForMail(helpEmail, /Thank you for contacting/)
    expect(helpMail.text).toMatch(/contact your own doctor, nurse or care provider/)
    expect(helpMail.text).toMatch(/stroke-support\.example\.org/)
    const eligibleMail = await waitForMail(eligibleEmail, /Thank you for contacting/)
    expect(eligibleMail.text).toMatch(/Someone from the study team will contact you/)
    expect(eligibleMail.text).not.toMatch(/spring|54|coast/i) // none of the person's answers

    const rows = (await lead.get(`/api/studies/${team.study.id}/participants?source=public_page&pageSize=100`)).body.participants
    const helpRow = rows.find((r: { contact: { email: string } }) => r.contact.email === helpEmail)
    expect(helpRow).toMatchObject({ status: 'not_eligible', helpSeeking: true })
    const detail = (await lead.get(`/api/studies/${team.study.id}/participants/${helpRow.id}`)).body
    expect(detail.timeline.map((e: { kind: string }) => e.kind)).toEqual(['enquiry', 'screening', 'email'])
  })

  it('refuses missing answers, numbers out of range, future dates and unknown questions, saving nothing', async () => {
    const before = (await lead.get(`/api/studies/${team.study.id}/participants`)).body.total
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10)
    const bad = await submit(enquiry({ ...ELIGIBLE_ANSWERS, age: 140, discharge_date: tomorrow, region: undefined, sneaky: 'x' }))
    expect(bad.status).toBe(400)
    const paths = bad.body.errors.map((e: { path: string }) => e.path).sort()
    expect(paths).toEqual(['answers.age', 'answers.discharge_date', 'answers.region', 'answers.sneaky'])
    const noContact = await submit({ ...enquiry(ELIGIBLE_ANSWERS), contact: { name: 'Nobody', email: '', phone: '' } })
    expect(noContact.status).toBe(400)
    expect(noContact.body.errors[0].path).toBe('contact.email')
    const noConsent = await submit({ ...enquiry(ELIGIBLE_ANSWERS), consentToContact: false })
    expect(noConsent.status).toBe(400)
    const huge = await submit(enquiry({ ...ELIGIBLE_ANSWERS, anything_else: 'x'.repeat(2001) }))
    expect(huge.status).toBe(400)
    expect((await lead.get(`/api/studies/${team.study.id}/participants`)).body.total).toBe(before)
    const [{ seq }] = await ctx.dataSource.query('SELECT participant_sequence AS seq FROM studies WHERE id = $1', [team.study.id])
    expect(seq).toBe(before)
  })

  it('keeps script in answers as plain text', async () => {
    const email = uniqueEmail('script')
    const answers = { ...ELIGIBLE_ANSWERS, anything_else: '<img src=x onerror=alert(1)>{{constructor.constructor("x")()}}' }
    expect((await submit(enquiry(answers, email))).status).toBe(201)
    const row = (await lead.get(`/api/studies/${team.study.id}/participants?search=${encodeURIComponent(email)}`)).body.participants[0]
    const detail = (await lead.get(`/api/studies/${team.study.id}/participants/${row.id}`)).body
    expect(detail.screenings[0].answers.anything_else).toBe(answers.anything_else)
  })

  it('quietly keeps nothing when the hidden honeypot field is filled', async () => {
    const before = (await lead.get(`/api/studies/${team.study.id}/participants`)).body.total
    const res = await submit(enquiry(ELIGIBLE_ANSWERS, uniqueEmail('robot'), { website: 'http://spam.example' }))
    expect(res.status).toBe(201)
    expect((await lead.get(`/api/studies/${team.study.id}/participants`)).body.total).toBe(before)
  })

  it('gives twenty concurrent submissions the next pseudonyms with no gap and no duplicate', async () => {
    const fresh = await createTestContext({ PUBLIC_ENQUIRIES_PER_HOUR: '500' })
    try {
      const t = await makeTeam(fresh.dataSource)
      const l = new Client(fresh.app)
      await l.signIn(t.users.lead.email, TEST_PASSWORD)
      await openRecruitment(l, t.study.id)
      const results = await Promise.all(Array.from({ length: 20 }, () => submit(enquiry(ELIGIBLE_ANSWERS), fresh.app, t.study.code)))
      expect(results.map((r) => r.status)).toEqual(Array(20).fill(201))
      const list = (await l.get(`/api/studies/${t.study.id}/participants?pageSize=100`)).body.participants
      const pseudonyms = list.map((p: { pseudonym: string }) => p.pseudonym).sort()
      expect(pseudonyms).toEqual(Array.from({ length: 20 }, (_, i) => `P${String(i + 1).padStart(2, '0')}`))
    } finally {
      await fresh.close()
    }
  })

  it('refuses a closed study and limits submissions per address', async () => {
    const limited = await createTestContext({ PUBLIC_ENQUIRIES_PER_HOUR: '2' })
    try {
      const t = await makeTeam(limited.dataSource)
      const l = new Client(limited.app)
      await l.signIn(t.users.lead.email, TEST_PASSWORD)
      await openRecruitment(l, t.study.id)
      expect((await submit(enquiry(ELIGIBLE_ANSWERS), limited.app, t.study.code)).status).toBe(201)
      expect((await submit(enquiry(ELIGIBLE_ANSWERS), limited.app, t.study.code)).status).toBe(201)
      const third = await submit(enquiry(ELIGIBLE_ANSWERS), limited.app, t.study.code)
      expect(third.status).toBe(429)
      expect(third.body.detail).toMatch(/try again in an hour/)
      await l.patch(`/api/studies/${t.study.id}/recruitment-settings`, { recruiting: false })
      expect((await request(limited.app).get(`/api/public/studies/${t.study.code}`)).body.recruiting).toBe(false)
    } finally {
      await limited.close()
    }
    await lead.patch(`/api/studies/${team.study.id}/recruitment-settings`, { recruiting: false })
    const closed = await submit(enquiry(ELIGIBLE_ANSWERS))
    expect(closed.status).toBe(409)
    expect(closed.body.detail).toMatch(/not taking new enquiries/)
    await lead.patch(`/api/studies/${team.study.id}/recruitment-settings`, { recruiting: true })
  })
})
