import { randomBytes, randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { decide, SITE_ACTIONS, STUDY_ACTIONS, type Access, type StudyRole } from '../../shared/permissions.js'
import { makeTeam, TEST_PASSWORD } from '../support/factories.js'
import { listRoutes } from '../support/routes.js'
import { Client, createTestContext, type TestContext } from '../support/test-app.js'

/**
 * The authorization matrix (OWASP Authorization Testing Automation cheat sheet; ASVS 5.0 8.1.1, 8.2.1):
 * every route registered in Express is called as every role, as a member of another study, as the
 * site administrator and signed out; the answer must match shared/permissions.ts.
 */
type SubjectName = 'anonymous' | StudyRole | 'siteAdmin' | 'otherStudyLead'
const SUBJECTS: SubjectName[] = ['anonymous', 'lead', 'coordinator', 'coder', 'partner', 'siteAdmin', 'otherStudyLead']

let ctx: TestContext
let team: Awaited<ReturnType<typeof makeTeam>>
const clients = new Map<SubjectName, Client>()

beforeAll(async () => {
  ctx = await createTestContext()
  team = await makeTeam(ctx.dataSource)
  const emails: Record<Exclude<SubjectName, 'anonymous'>, string> = {
    lead: team.users.lead.email,
    coordinator: team.users.coordinator.email,
    coder: team.users.coder.email,
    partner: team.users.partner.email,
    siteAdmin: team.users.admin.email,
    otherStudyLead: team.users.outsider.email,
  }
  for (const subject of SUBJECTS) {
    const client = new Client(ctx.app)
    await client.refreshCsrf()
    if (subject !== 'anonymous') {
      const res = await client.signIn(emails[subject], TEST_PASSWORD)
      expect(res.status, `sign-in as ${subject}`).toBe(200)
    }
    clients.set(subject, client)
  }
})
afterAll(() => ctx?.close())

function expectedDecision(subject: SubjectName, access: Access) {
  const role: StudyRole | null = subject === 'anonymous' || subject === 'siteAdmin' || subject === 'otherStudyLead' ? null : subject
  return decide({ signedIn: subject !== 'anonymous', siteAdmin: subject === 'siteAdmin', role }, access)
}

function concretePath(path: string): string {
  return path
    .replace(':studyId', team.study.id)
    .replace(/:(memberId|invitationId|userId)/g, () => randomUUID())
    .replace(':token', randomBytes(32).toString('base64url'))
}

function isKnownAccess(access: Access): boolean {
  if (access === 'public' || access === 'signedIn') return true
  if (access.startsWith('site:')) return access.slice(5) in SITE_ACTIONS
  return access.slice(6) in STUDY_ACTIONS
}

describe('authorization matrix', () => {
  it('finds the API routes in the Express router', () => {
    const routes = listRoutes(ctx.app).filter((r) => r.path.startsWith('/api/'))
    expect(routes.length).toBeGreaterThan(20)
    expect(routes.map((r) => `${r.method} ${r.path}`)).toContain('GET /api/studies/:studyId/audit')
  })

  it('every API route declares an access rule that exists in shared/permissions.ts', () => {
    const missing = listRoutes(ctx.app)
      .filter((r) => r.path.startsWith('/api/'))
      .filter((r) => !r.access || !isKnownAccess(r.access))
      .map((r) => `${r.method} ${r.path} (${r.access ?? 'no guard'})`)
    expect(missing, 'routes missing from the permission matrix').toEqual([])
  })

  it('answers every route as every role exactly as the matrix says', async () => {
    // sign-out ends the caller's session, so it goes last
    const routes = listRoutes(ctx.app)
      .filter((r) => r.path.startsWith('/api/') && r.access)
      .sort((a, b) => Number(a.path === '/api/auth/logout') - Number(b.path === '/api/auth/logout'))
    const mismatches: string[] = []
    for (const route of routes) {
      for (const subject of SUBJECTS) {
        const client = clients.get(subject)!
        const path = concretePath(route.path)
        const method = route.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete'
        const res = method === 'get' ? await client.get(path) : await client[method](path, {})
        const expected = expectedDecision(subject, route.access!)
        const ok =
          expected === 'allow' ? res.status !== 401 && res.status !== 403 && res.status < 500 : res.status === (expected === 'unauthenticated' ? 401 : 403)
        if (!ok) mismatches.push(`${route.method} ${route.path} as ${subject}: expected ${expected}, got ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`)
      }
    }
    expect(mismatches).toEqual([])
  })

  it('never lets a coder or patient partner reach a route that returns identifying data', () => {
    // routes whose answers hold contact details, consent records, identifiable transcript text or the
    // anonymisation log: only the lead and coordinators may call them (design: coders and patient
    // partners never receive identifying data)
    // (report exports of aggregates with small cells suppressed, consented quotes, checklists and the codebook are de-identified and open to coders)
    const identifying = [/\/participants\/:participantId(\/|$)/, /\/consent/, /\/deidentification/, /\/anonymisation-log/, /\/exports\/(screening-log|audit)/, /\/invitations$/, /\/audit$/, /\/interviews/]
    const leaks = listRoutes(ctx.app)
      .filter((r) => r.path.startsWith('/api/studies/') && identifying.some((re) => re.test(r.path)))
      .filter((r) => (['coder', 'partner'] as const).some((role) => decide({ signedIn: true, siteAdmin: false, role }, r.access!) === 'allow'))
      .map((r) => `${r.method} ${r.path} (${r.access})`)
    expect(leaks).toEqual([])
  })

  it('a removed member loses access on the very next request', async () => {
    const fresh = await createTestContext()
    try {
      const t = await makeTeam(fresh.dataSource)
      const coder = new Client(fresh.app)
      expect((await coder.signIn(t.users.coder.email, TEST_PASSWORD)).status).toBe(200)
      expect((await coder.get(`/api/studies/${t.study.id}`)).status).toBe(200)
      const lead = new Client(fresh.app)
      await lead.signIn(t.users.lead.email, TEST_PASSWORD)
      expect((await lead.delete(`/api/studies/${t.study.id}/members/${t.memberships.coder.id}`)).status).toBe(204)
      expect((await coder.get(`/api/studies/${t.study.id}`)).status).toBe(403)
    } finally {
      await fresh.close()
    }
  })
})
