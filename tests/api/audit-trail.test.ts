import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeTeam, TEST_PASSWORD, uniqueEmail } from '../support/factories.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/** The audit trail: append-only at the database level (21 CFR 11.10(e); ASVS 5.0 16.4.2). */
let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
let lead: Client
beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  lead = new Client(ctx.app)
  await lead.signIn(team.users.lead.email, TEST_PASSWORD)
})
afterAll(() => ctx?.close())

describe('audit trail', () => {
  it('refuses UPDATE, DELETE and TRUNCATE on the audit table, even from the app\'s own database role', async () => {
    await lead.patch(`/api/studies/${team.study.id}`, { summary: 'An audited change' })
    const [row] = await ctx.dataSource.query(`SELECT id FROM audit_events WHERE study_id = $1 LIMIT 1`, [team.study.id])
    expect(row).toBeDefined()
    await expect(ctx.dataSource.query(`UPDATE audit_events SET action = 'tampered' WHERE id = $1`, [row.id])).rejects.toThrow(/append-only/)
    await expect(ctx.dataSource.query(`DELETE FROM audit_events WHERE id = $1`, [row.id])).rejects.toThrow(/append-only/)
    await expect(ctx.dataSource.query(`TRUNCATE audit_events`)).rejects.toThrow(/append-only/)
    const [still] = await ctx.dataSource.query(`SELECT action FROM audit_events WHERE id = $1`, [row.id])
    expect(still.action).not.toBe('tampered')
  })

  it('records sign-in, sign-out, invitations, role changes and study changes with actor, time and address', async () => {
    const coder = new Client(ctx.app)
    await coder.signIn(team.users.coder.email, TEST_PASSWORD)
    await coder.post('/api/auth/logout')
    await new Client(ctx.app).signIn(team.users.coder.email, 'definitely not the password')
    const invited = uniqueEmail('invitee')
    expect((await lead.post(`/api/studies/${team.study.id}/invitations`, { email: invited, role: 'coder' })).status).toBe(201)
    expect((await lead.patch(`/api/studies/${team.study.id}/members/${team.memberships.partner.id}`, { role: 'coordinator' })).status).toBe(200)
    expect((await lead.patch(`/api/studies/${team.study.id}`, { targetSampleSize: 14 })).status).toBe(200)

    const rows: { action: string; actor_email: string; ip: string; at: Date; details: Record<string, unknown> }[] = await ctx.dataSource.query(
      `SELECT action, actor_email, ip, at, details FROM audit_events ORDER BY id`,
    )
    const actions = rows.map((r) => r.action)
    for (const expected of ['auth.signed_in', 'auth.signed_out', 'auth.sign_in_failed', 'invitation.sent', 'member.role_changed', 'study.updated']) {
      expect(actions).toContain(expected)
    }
    const roleChange = rows.find((r) => r.action === 'member.role_changed')!
    expect(roleChange.actor_email).toBe(team.users.lead.email)
    expect(roleChange.details).toEqual({ from: 'partner', to: 'coordinator' })
    expect(roleChange.ip).toMatch(/127\.0\.0\.1/)
    const change = rows.find((r) => r.action === 'study.updated' && 'targetSampleSize' in ((r.details.changes as object) ?? {}))!
    expect(change.details.changes).toEqual({ targetSampleSize: { from: null, to: 14 } })
  })

  it('lets the lead page and filter the study\'s trail on the server', async () => {
    for (let i = 0; i < 4; i++) await lead.patch(`/api/studies/${team.study.id}`, { summary: `Revision ${i}` })
    const first = await lead.get(`/api/studies/${team.study.id}/audit?page=1&pageSize=2`)
    expect(first.status).toBe(200)
    expect(first.body.events).toHaveLength(2)
    expect(first.body.total).toBeGreaterThanOrEqual(6)
    const second = await lead.get(`/api/studies/${team.study.id}/audit?page=2&pageSize=2`)
    expect(second.body.events[0].id).not.toBe(first.body.events[0].id)
    const filtered = await lead.get(`/api/studies/${team.study.id}/audit?action=invitation&pageSize=50`)
    expect(filtered.body.events.length).toBeGreaterThan(0)
    expect(filtered.body.events.every((e: { action: string }) => e.action.startsWith('invitation.'))).toBe(true)
    const byActor = await lead.get(`/api/studies/${team.study.id}/audit?actor=${encodeURIComponent('nobody@else')}`)
    expect(byActor.body.total).toBe(0)
  })

  it('keeps one study\'s trail out of another study\'s view', async () => {
    const outsider = new Client(ctx.app)
    await outsider.signIn(team.users.outsider.email, TEST_PASSWORD)
    const own = await outsider.get(`/api/studies/${team.other.id}/audit`)
    expect(own.status).toBe(200)
    expect(own.body.events.every((e: { targetId: string }) => e.targetId !== team.study.id)).toBe(true)
    expect((await outsider.get(`/api/studies/${team.study.id}/audit`)).status).toBe(403)
  })
})

describe('site-wide audit trail', () => {
  it('shows the site administrator sign-ins and failed sign-ins, and only the administrator', async () => {
    const admin = new Client(ctx.app)
    await admin.signIn(team.users.admin.email, TEST_PASSWORD)
    await new Client(ctx.app).signIn(team.users.coordinator.email, 'a wrong password for the trail')
    const res = await admin.get('/api/audit?action=auth.sign_in_failed&pageSize=100')
    expect(res.status).toBe(200)
    expect(res.body.events.some((e: { actorEmail: string }) => e.actorEmail === team.users.coordinator.email)).toBe(true)
    // study changes stay in the study's own trail
    const all = await admin.get('/api/audit?pageSize=100')
    expect(all.body.events.some((e: { action: string }) => e.action === 'study.updated')).toBe(false)
    expect((await lead.get('/api/audit')).status).toBe(403)
  })
})
