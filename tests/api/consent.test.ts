import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ConsentLink } from '../../server/modules/consent/consent-link.entity.js'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { approvedForm, FORM_V1, makePdf, uploadForm } from '../support/consent.js'
import { linkIn, waitForMail } from '../support/mailbox.js'
import { ELIGIBLE_ANSWERS, openRecruitment } from '../support/recruitment.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
let coordinator: Client
let v1: { id: string; label: string; documentSha256: string; file: { sha256: string } }
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
  coordinator = new Client(ctx.app)
  await coordinator.signIn(team.users.coordinator.email, TEST_PASSWORD)
  await openRecruitment(lead, team.study.id)
  v1 = await approvedForm(lead, team.study.id)
  await ctx.startMailWorker()
})
afterAll(() => ctx?.close())

const base = () => `/api/studies/${team.study.id}`
const ALL_YES = { audio_recording: true, direct_quotes: true, future_contact: true }

async function eligibleParticipant(email = uniqueEmail('consenter')) {
  const res = await coordinator.post(`${base()}/participants`, {
    contact: { name: 'Casey Consent', email, phone: '', country: '', timeZone: '' },
    source: 'phone',
    answers: ELIGIBLE_ANSWERS,
  })
  expect(res.body.status).toBe('eligible')
  return { id: res.body.id as string, email }
}

async function sendLink(participantId: string, email: string) {
  const res = await coordinator.post(`${base()}/participants/${participantId}/consent-links`, {})
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  const mail = await waitForMail(email, /Your consent form/)
  return linkIn(mail, '/consent')
}

async function sign(token: string, body: object) {
  const anon = new Client(ctx.app)
  await anon.refreshCsrf()
  return anon.post(`/api/public/consent/${token}`, body)
}

describe('consent form versions', () => {
  it('stores the file with its SHA-256, and refuses a file that is not a PDF or .docx by its content', async () => {
    const created = await uploadForm(lead, team.study.id, { ...FORM_V1, label: 'v-check' })
    expect(created.status).toBe(201)
    expect(created.body.file.sha256).toMatch(/^[0-9a-f]{64}$/)
    expect(created.body.status).toBe('draft')
    const download = await lead.get(`${base()}/consent-forms/${created.body.id}/file`)
    expect(download.headers['content-disposition']).toMatch(/^attachment;/)
    const disguised = await uploadForm(lead, team.study.id, { ...FORM_V1, label: 'v-fake' }, { buffer: Buffer.from('just some text, not a PDF'), name: 'form.pdf' })
    expect(disguised.status).toBe(415)
    expect(disguised.body.detail).toMatch(/not PDF or Word/)
    expect((await uploadForm(coordinator, team.study.id, FORM_V1)).status).toBe(403)
    const forms = (await lead.get(`${base()}/consent-forms`)).body.forms
    expect(forms.some((f: { label: string }) => f.label === 'v-fake')).toBe(false)
  })

  it('lets the lead tick the checklist on an approved version but not change its text', async () => {
    expect((await lead.patch(`${base()}/consent-forms/${v1.id}`, { checklist: { risks: true } })).body.checklist).toEqual({ risks: true })
    const edit = await lead.patch(`${base()}/consent-forms/${v1.id}`, { text: 'Changed after approval.' })
    expect(edit.status).toBe(409)
  })
})

describe('electronic consent', () => {
  it('goes from the e-mailed link to a consent record bound to the exact version, a receipt and a new status', async () => {
    const p = await eligibleParticipant()
    const token = await sendLink(p.id, p.email)
    const anon = new Client(ctx.app)
    const page = await anon.get(`/api/public/consent/${token}`)
    expect(page.status).toBe(200)
    expect(page.body).toMatchObject({ formLabel: 'v1.0', clauses: FORM_V1.clauses })
    expect((await sign(token, { clauses: { audio_recording: true, direct_quotes: false }, signerName: 'Casey Consent', agree: true })).status).toBe(400)
    expect((await sign(token, { clauses: ALL_YES, signerName: '   ', agree: true })).status).toBe(400)
    const signed = await sign(token, { clauses: { ...ALL_YES, direct_quotes: false }, signerName: 'Casey Consent', agree: true })
    expect(signed.status).toBe(201)
    expect(signed.body).toMatchObject({ signerName: 'Casey Consent', formLabel: 'v1.0', meaning: expect.stringMatching(/Signed electronically/) })

    const view = (await coordinator.get(`${base()}/participants/${p.id}/consent`)).body
    expect(view.current).toMatchObject({ method: 'electronic', formLabel: 'v1.0', signerName: 'Casey Consent', documentSha256: v1.documentSha256 })
    expect(view.current.clauses).toEqual({ audio_recording: true, direct_quotes: false, future_contact: true })
    expect(view.dataUse).toMatchObject({ mayCode: true, mayQuote: false, mayShowPartners: false, notesOnly: false })
    expect((await coordinator.get(`${base()}/participants/${p.id}`)).body.status).toBe('consented')
    const [row] = await ctx.dataSource.query('SELECT address_hash, user_agent FROM consent_records WHERE participant_id = $1', [p.id])
    expect(row.address_hash).toMatch(/^[0-9a-f]{64}$/)
    expect(row.address_hash).not.toContain('127.0.0.1')

    const receipt = await waitForMail(p.email, /Your signed consent/)
    expect(receipt.attachments).toEqual([expect.objectContaining({ filename: 'consent-receipt.pdf', contentType: 'application/pdf' })])
    expect(receipt.text).toMatch(/\/withdraw\//)
    const pdf = await coordinator.get(`${base()}/participants/${p.id}/consents/${view.current.id}/receipt.pdf`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers['content-type']).toBe('application/pdf')
  })

  it('works once: reuse, expiry and a forged token all get the same answer', async () => {
    const p = await eligibleParticipant()
    const token = await sendLink(p.id, p.email)
    expect((await sign(token, { clauses: ALL_YES, signerName: 'Once Only', agree: true })).status).toBe(201)
    const reused = await sign(token, { clauses: ALL_YES, signerName: 'Once Only', agree: true })
    expect(reused.status).toBe(410)
    const forged = await sign(token.slice(0, -2) + (token.endsWith('AA') ? 'BB' : 'AA'), { clauses: ALL_YES, signerName: 'X', agree: true })
    expect(forged.status).toBe(410)
    expect(forged.body.detail).toBe(reused.body.detail)
    expect(reused.body.detail).toMatch(/ask for a new link/)

    const q = await eligibleParticipant()
    const late = await sendLink(q.id, q.email)
    await ctx.dataSource.getRepository(ConsentLink).update({ participantId: q.id }, { expiresAt: new Date(Date.now() - 1000) })
    expect((await new Client(ctx.app).get(`/api/public/consent/${late}`)).status).toBe(410)
  })

  it('keeps exactly one record when the same link is submitted twice at the same moment', async () => {
    const p = await eligibleParticipant()
    const token = await sendLink(p.id, p.email)
    const results = await Promise.all([1, 2, 3].map(() => sign(token, { clauses: ALL_YES, signerName: 'Double Click', agree: true })))
    expect(results.map((r) => r.status).sort()).toEqual([201, 410, 410])
    const [{ n }] = await ctx.dataSource.query('SELECT count(*)::int AS n FROM consent_records WHERE participant_id = $1', [p.id])
    expect(n).toBe(1)
  })
})

describe('consent records, supersede and re-consent', () => {
  it('records verbal consent, corrects it with a new record, and refuses to edit a record in place', async () => {
    const p = await eligibleParticipant()
    const first = await coordinator.post(`${base()}/participants/${p.id}/consents`, { formId: v1.id, clauses: ALL_YES, signerName: 'Vera Verbal', witnessName: 'Tomas Witness' })
    expect(first.status).toBe(201)
    expect(first.body.current.meaning).toMatch(/Verbal agreement .* recorded by .*witnessed by Tomas Witness/)
    const wrong = first.body.current.id
    const fixed = await coordinator.post(`${base()}/participants/${p.id}/consents`, { formId: v1.id, clauses: { ...ALL_YES, future_contact: false }, signerName: 'Vera Verbal', corrects: wrong })
    expect(fixed.status).toBe(201)
    expect(fixed.body.records).toHaveLength(2)
    expect(fixed.body.current.corrects).toBe(wrong)
    expect(fixed.body.records.find((r: { id: string }) => r.id === wrong).correctedBy).toBe(fixed.body.current.id)
    await expect(ctx.dataSource.query(`UPDATE consent_records SET signer_name = 'x' WHERE id = $1`, [wrong])).rejects.toThrow(/immutable/)
    await expect(ctx.dataSource.query(`DELETE FROM consent_records WHERE id = $1`, [wrong])).rejects.toThrow(/immutable/)
  })

  it('records written consent with the signed scan, refusing a scan of the wrong kind', async () => {
    const p = await eligibleParticipant()
    const metadata = JSON.stringify({ formId: v1.id, clauses: ALL_YES, signerName: 'Wren Written' })
    const bad = await coordinator.agent.post(`${base()}/participants/${p.id}/consents/written`).set('X-CSRF-Token', coordinator.csrf).field('metadata', metadata).attach('file', Buffer.from('MZ fake exe'), 'scan.pdf')
    expect(bad.status).toBe(415)
    const ok = await coordinator.agent.post(`${base()}/participants/${p.id}/consents/written`).set('X-CSRF-Token', coordinator.csrf).field('metadata', metadata).attach('file', await makePdf('signed'), 'scan.pdf')
    expect(ok.status).toBe(201)
    expect(ok.body.current).toMatchObject({ method: 'written', signedFileName: 'scan.pdf' })
  })

  it('approving a new version supersedes the old one and queues everyone still on it for re-consent', async () => {
    const p = await eligibleParticipant()
    await coordinator.post(`${base()}/participants/${p.id}/consents`, { formId: v1.id, clauses: ALL_YES, signerName: 'Quinn Queue' })
    const v2 = await approvedForm(lead, team.study.id, { ...FORM_V1, label: 'v2.0', text: `${FORM_V1.text} A new section on data sharing.` })
    const forms = (await lead.get(`${base()}/consent-forms`)).body.forms
    expect(forms.find((f: { id: string }) => f.id === v1.id).status).toBe('superseded')
    expect(v2.status).toBe('approved')
    const summary = (await coordinator.get(`${base()}/consent/summary`)).body
    const queued = summary.reconsentQueue.find((q: { participantId: string }) => q.participantId === p.id)
    expect(queued).toMatchObject({ formLabel: 'v1.0', linkWaiting: false })
    expect(summary.perVersion.find((v: { label: string }) => v.label === 'v2.0').consented).toBe(0)
    expect((await coordinator.post(`${base()}/participants/${p.id}/consents`, { formId: v1.id, clauses: ALL_YES, signerName: 'Quinn Queue' })).status).toBe(409)
    // one click sends a link for the approved version; the queue shows it waiting
    expect((await coordinator.post(`${base()}/participants/${p.id}/consent-links`, {})).status).toBe(201)
    const after = (await coordinator.get(`${base()}/consent/summary`)).body
    expect(after.reconsentQueue.find((q: { participantId: string }) => q.participantId === p.id).linkWaiting).toBe(true)
    expect(after.waitingLinks.some((l: { participantId: string; formLabel: string }) => l.participantId === p.id && l.formLabel === 'v2.0')).toBe(true)
  })
})

describe('withdrawal', () => {
  it('withdrawing data inside the deadline takes it out of analysis at once, and is audited', async () => {
    const p = await eligibleParticipant()
    await coordinator.post(`${base()}/participants/${(p.id)}/consents`, { formId: (await lead.get(`${base()}/consent-forms`)).body.forms.find((f: { status: string }) => f.status === 'approved').id, clauses: ALL_YES, signerName: 'Willa Withdraw' })
    const res = await coordinator.post(`${base()}/participants/${p.id}/withdrawal`, { scope: 'withdraw_data', effectiveDate: new Date().toISOString().slice(0, 10), reason: 'Family circumstances' })
    expect(res.status).toBe(201)
    expect(res.body.withdrawal).toMatchObject({ scope: 'withdraw_data', dataRemoved: true, withinDeadline: true })
    expect(res.body.dataUse).toMatchObject({ mayCode: false, mayQuote: false, mayShowPartners: false })
    expect((await coordinator.get(`${base()}/participants/${p.id}`)).body.status).toBe('withdrawn')
    const [audit] = await ctx.dataSource.query(`SELECT details FROM audit_events WHERE action = 'participant.withdrawn' AND target_id = $1`, [p.id])
    expect(audit.details).toMatchObject({ excludedFromAnalysis: true })
    expect((await coordinator.post(`${base()}/participants/${p.id}/withdrawal`, { scope: 'stop_keep_data', effectiveDate: '2026-01-01' })).status).toBe(409)
    await waitForMail(p.email, /Your withdrawal/)
  })

  it('after the deadline the lead must record the decision, and the data stays', async () => {
    await lead.patch(`${base()}/recruitment-settings`, { withdrawalRule: { kind: 'until_date', date: '2020-01-01' } })
    try {
      const p = await eligibleParticipant()
      const form = (await lead.get(`${base()}/consent-forms`)).body.forms.find((f: { status: string }) => f.status === 'approved')
      await coordinator.post(`${base()}/participants/${p.id}/consents`, { formId: form.id, clauses: ALL_YES, signerName: 'Lateo Late' })
      const today = new Date().toISOString().slice(0, 10)
      const missing = await lead.post(`${base()}/participants/${p.id}/withdrawal`, { scope: 'withdraw_data', effectiveDate: today })
      expect(missing.status).toBe(400)
      expect(missing.body.detail).toMatch(/deadline for withdrawing data has passed/)
      const ok = await lead.post(`${base()}/participants/${p.id}/withdrawal`, { scope: 'withdraw_data', effectiveDate: today, decisionNote: 'Already in the published analysis; kept, per the ethics board.' })
      expect(ok.body.withdrawal).toMatchObject({ dataRemoved: false, withinDeadline: false })
      expect(ok.body.dataUse.mayCode).toBe(true)
    } finally {
      await lead.patch(`${base()}/recruitment-settings`, { withdrawalRule: { kind: 'any_time' } })
    }
  })

  it('a participant asks to withdraw through the receipt link without an account; the team is told and they get an acknowledgement', async () => {
    const p = await eligibleParticipant()
    const token = await sendLink(p.id, p.email)
    await sign(token, { clauses: ALL_YES, signerName: 'Remy Request', agree: true })
    const receipt = await waitForMail(p.email, /Your signed consent/)
    const withdrawToken = linkIn(receipt, '/withdraw')
    const anon = new Client(ctx.app)
    await anon.refreshCsrf()
    expect((await anon.get(`/api/public/withdrawal/${withdrawToken}`)).body).toMatchObject({ alreadyRequested: false, deadlineText: expect.any(String) })
    expect((await anon.post(`/api/public/withdrawal/${withdrawToken}`, { scope: 'withdraw_data', reason: 'Changed my mind' })).status).toBe(202)
    expect((await anon.get(`/api/public/withdrawal/${withdrawToken}`)).body.alreadyRequested).toBe(true)
    await waitForMail(p.email, /We received your request/)
    const queue = (await coordinator.get(`${base()}/consent/summary`)).body.withdrawalRequests
    const request = queue.find((r: { participantId: string }) => r.participantId === p.id)
    expect(request).toMatchObject({ scope: 'withdraw_data', status: 'open' })
    const recorded = await coordinator.post(`${base()}/participants/${p.id}/withdrawal`, { scope: 'withdraw_data', effectiveDate: new Date().toISOString().slice(0, 10), requestId: request.id })
    expect(recorded.status).toBe(201)
    expect((await coordinator.get(`${base()}/consent/summary`)).body.withdrawalRequests.some((r: { id: string }) => r.id === request.id)).toBe(false)
    expect((await new Client(ctx.app).get('/api/public/withdrawal/not-a-real-token-at-all')).status).toBe(410)
  })

  it('keeps consent records away from coders and patient partners', async () => {
    const coder = new Client(ctx.app)
    await coder.signIn(team.users.coder.email, TEST_PASSWORD)
    const p = await eligibleParticipant()
    expect((await coder.get(`${base()}/participants/${p.id}/consent`)).status).toBe(403)
    expect((await coder.get(`${base()}/consent-forms`)).status).toBe(403)
    expect((await coder.get(`${base()}/consent/summary`)).status).toBe(403)
  })
})
