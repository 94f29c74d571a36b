import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ADMIN, DEMO_PASSWORD, DEMO_STUDY, DEMO_TEAM } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { type E2E, screenshot, seriousA11yViolations, signIn, signInAndArrive, startE2E } from './support/browser.js'

/** Each demo role signs in through the browser and sees only the sections its role may open. */
let e2e: E2E
let studyId: string
beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test')).studyId
})
afterAll(() => e2e?.close())

const SECTIONS = ['Overview', 'Team', 'Audit trail'] as const
const EXPECTED: Record<string, (typeof SECTIONS)[number][]> = {
  lead: ['Overview', 'Team', 'Audit trail'],
  coordinator: ['Overview', 'Team'],
  coder: ['Overview', 'Team'],
  partner: ['Overview', 'Team'],
}

describe('signing in as each demo role', () => {
  it('shows a sign-in page without serious accessibility problems', async () => {
    const page = await e2e.newPage()
    await page.goto(`${e2e.baseUrl}/sign-in`)
    await page.getByRole('button', { name: 'Sign in' }).waitFor()
    await screenshot(page, '01-sign-in')
    expect(await seriousA11yViolations(page)).toEqual([])
    // a wrong password gets a readable message, not a stack trace
    await signIn(page, e2e.baseUrl, 'lead@heardwell.test', 'this is not the password')
    await expect(page.getByText('The e-mail or password is not right.').waitFor()).resolves.toBeUndefined()
    await page.close()
  })

  for (const member of DEMO_TEAM) {
    it(`${member.email} (${member.role}) reaches the study overview with only the sections of that role`, async () => {
      const page = await e2e.newPage()
      await signInAndArrive(page, e2e.baseUrl, member.email, DEMO_PASSWORD)
      await page.goto(`${e2e.baseUrl}/studies/${studyId}`)
      await page.getByRole('heading', { name: DEMO_STUDY.title }).first().waitFor()
      const nav = page.getByRole('navigation', { name: 'Main' })
      for (const section of SECTIONS) {
        const visible = await nav.getByText(section, { exact: true }).isVisible()
        expect(visible, `${member.role} sees "${section}"`).toBe(EXPECTED[member.role]!.includes(section))
      }
      await screenshot(page, `02-overview-${member.email.split('@')[0]}`)
      expect(await seriousA11yViolations(page)).toEqual([])
      // a section outside the role is refused by the server too, not only hidden
      const audit = await page.evaluate(async (id) => (await fetch(`/api/studies/${id}/audit`)).status, studyId)
      expect(audit).toBe(member.role === 'lead' ? 200 : 403)
      await page.close()
    })
  }

  it(`${DEMO_ADMIN.email} (site administrator) sees site administration and no study trail`, async () => {
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, DEMO_ADMIN.email, DEMO_PASSWORD)
    const nav = page.getByRole('navigation', { name: 'Main' })
    await nav.getByText('Site administration').waitFor()
    await nav.getByText('Site administration').click()
    await page.getByText('admin@heardwell.test').first().waitFor()
    await screenshot(page, '03-site-administration')
    expect(await seriousA11yViolations(page)).toEqual([])
    const audit = await page.evaluate(async (id) => (await fetch(`/api/studies/${id}/audit`)).status, studyId)
    expect(audit).toBe(403)
    // the site-wide trail shows this very sign-in
    await nav.getByText('Site audit trail').click()
    await page.getByRole('cell', { name: 'auth.signed_in' }).first().waitFor()
    await screenshot(page, '04-site-audit-trail')
    expect(await seriousA11yViolations(page)).toEqual([])
    await page.close()
  })
})
