import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeTeam, makeUser, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { waitForMail } from '../support/mailbox.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let admin: Client
let lead: Client
beforeAll(async () => {
  ctx = await createTestContext()
  await ctx.startMailWorker()
  team = await makeTeam(ctx.dataSource)
  admin = new Client(ctx.app)
  await admin.signIn(team.users.admin.email, TEST_PASSWORD)
  lead = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
})
afterAll(() => ctx?.close())

describe('studies', () => {
  it('the site administrator creates a study and names an existing account as its lead', async () => {
    const res = await admin.post('/api/studies', { code: 'nw-01', title: 'Night Walks', leadEmail: team.users.coder.email })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({ code: 'NW-01', title: 'Night Walks', leadName: 'Test Person', memberCount: 1 })
    const coder = new Client(ctx.app)
    await coder.signIn(team.users.coder.email, TEST_PASSWORD)
    const mine = await coder.get('/api/studies')
    expect(mine.body.studies.find((s: { code: string }) => s.code === 'NW-01')?.myRole).toBe('lead')
    const duplicate = await admin.post('/api/studies', { code: 'NW-01', title: 'Again', leadEmail: team.users.coder.email })
    expect(duplicate.status).toBe(409)
  })

  it('names a lead without an account by e-mailed invitation', async () => {
    const email = uniqueEmail('futurelead')
    const res = await admin.post('/api/studies', { code: 'INV-1', title: 'Invited Lead Study', leadEmail: email })
    expect(res.status).toBe(201)
    expect(res.body.memberCount).toBe(0)
    const mail = await waitForMail(email, /invited to join "Invited Lead Study"/)
    expect(mail.text).toMatch(/as lead researcher/)
  })

  it('lists only the studies a person belongs to; the administrator sees all', async () => {
    const outsider = new Client(ctx.app)
    await outsider.signIn(team.users.outsider.email, TEST_PASSWORD)
    const codes = (await outsider.get('/api/studies')).body.studies.map((s: { code: string }) => s.code)
    expect(codes).toEqual([team.other.code])
    const all = (await admin.get('/api/studies')).body.studies.map((s: { code: string }) => s.code)
    expect(all).toEqual(expect.arrayContaining([team.study.code, team.other.code]))
  })

  it('the lead edits the set-up; dates out of order are refused with a field message', async () => {
    const ok = await lead.patch(`/api/studies/${team.study.id}`, {
      ethicsBoard: 'Riverside Research Ethics Board',
      ethicsReference: 'RREB-22-101',
      approvalDate: '2026-01-10',
      approvalExpiry: '2027-01-09',
      targetSampleSize: 12,
    })
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({ ethicsBoard: 'Riverside Research Ethics Board', approvalExpiry: '2027-01-09', targetSampleSize: 12 })
    const bad = await lead.patch(`/api/studies/${team.study.id}`, { approvalDate: '2027-05-01', approvalExpiry: '2027-01-01' })
    expect(bad.status).toBe(400)
    expect(bad.body.errors).toEqual([{ path: 'approvalExpiry', message: expect.stringMatching(/after the approval date/) }])
  })
})

describe('team', () => {
  it('the lead changes a role and cannot leave the study without a lead', async () => {
    const changed = await lead.patch(`/api/studies/${team.study.id}/members/${team.memberships.coordinator.id}`, { role: 'coder' })
    expect(changed.status).toBe(200)
    expect(changed.body.role).toBe('coder')
    const demote = await lead.patch(`/api/studies/${team.study.id}/members/${team.memberships.lead.id}`, { role: 'coder' })
    expect(demote.status).toBe(409)
    expect(demote.body.detail).toMatch(/at least one lead/)
    expect((await lead.delete(`/api/studies/${team.study.id}/members/${team.memberships.lead.id}`)).status).toBe(409)
  })

  it('the administrator hands the study to a new lead', async () => {
    const newLead = await makeUser(ctx.dataSource, { email: uniqueEmail('newlead'), name: 'New Lead' })
    const res = await admin.put(`/api/studies/${team.other.id}/lead`, { email: newLead.email })
    expect(res.status).toBe(200)
    const members = await admin.get(`/api/studies/${team.other.id}/members`)
    expect(members.body.members.filter((m: { role: string }) => m.role === 'lead')).toHaveLength(2)
  })

  it('lists open invitations and refuses to invite a current member', async () => {
    const email = uniqueEmail('invitee')
    await lead.post(`/api/studies/${team.study.id}/invitations`, { email, role: 'partner' })
    const list = await lead.get(`/api/studies/${team.study.id}/invitations`)
    expect(list.body.invitations).toEqual(expect.arrayContaining([expect.objectContaining({ email, role: 'partner', status: 'open', invitedBy: 'Lead Person' })]))
    const dup = await lead.post(`/api/studies/${team.study.id}/invitations`, { email: team.users.partner.email, role: 'coder' })
    expect(dup.status).toBe(409)
  })

  it('the site administrator creates accounts that choose their own password by e-mail', async () => {
    const email = uniqueEmail('newaccount')
    const res = await admin.post('/api/users', { email, name: 'Orla Newcome' })
    expect(res.status).toBe(201)
    expect(res.body).not.toHaveProperty('passwordHash')
    const mail = await waitForMail(email, /choose a password/)
    expect(mail.text).toMatch(/reset-password\//)
    expect((await admin.post('/api/users', { email, name: 'Again' })).status).toBe(409)
  })
})
