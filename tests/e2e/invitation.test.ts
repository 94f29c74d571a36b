import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD, DEMO_STUDY } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { waitForMail } from '../support/mailbox.js'
import { screenshot, seriousA11yViolations, signIn, startE2E, type E2E } from './support/browser.js'

/** The lead invites a new coordinator; the invitee follows the e-mailed link and joins the study. */
let e2e: E2E
beforeAll(async () => {
  e2e = await startE2E()
  await seedDemo(e2e.ctx.dataSource, 'test')
  await e2e.ctx.startMailWorker()
})
afterAll(() => e2e?.close())

describe('inviting a team member', () => {
  it('goes from the team page to the e-mail to a signed-in new member', async () => {
    const email = `new.coordinator.${Date.now()}@example.org`
    const page = await e2e.newPage()
    await signIn(page, e2e.baseUrl, 'lead@heardwell.test', DEMO_PASSWORD)
    await page.getByText(DEMO_STUDY.title).first().click()
    await page.getByRole('navigation', { name: 'Main' }).getByText('Team', { exact: true }).click()
    await page.getByRole('button', { name: 'Invite someone' }).click()
    const dialog = page.getByRole('dialog')
    await dialog.getByLabel('E-mail address').fill(email)
    // choose the role with the keyboard, as a keyboard user would
    await dialog.getByLabel('Role on this study').focus()
    await page.keyboard.press('ArrowDown')
    await page.getByRole('option', { name: 'Coordinator' }).click()
    await dialog.getByRole('button', { name: 'Send the invitation' }).click()
    await page.getByText(email).first().waitFor()
    await screenshot(page, '05-team-invitation-sent')

    // the message reaches the (fake) mail server and shows on the development mailbox page
    await waitForMail(email, /invited to join/)
    await page.goto(`${e2e.baseUrl}/dev/mailbox`)
    await page.getByText(`To ${email}`).click()
    await page.getByRole('link', { name: /\/invitations\// }).first().waitFor()
    await screenshot(page, '06-dev-mailbox')
    expect(await seriousA11yViolations(page)).toEqual([])
    await e2e.browser.clearCookies()
    await page.getByRole('link', { name: /\/invitations\// }).first().click()

    await page.getByLabel('Your name').fill('Casey Newland')
    await page.getByLabel('Choose a password', { exact: true }).fill('kettle on, notebook open, ready')
    await screenshot(page, '07-accept-invitation')
    expect(await seriousA11yViolations(page)).toEqual([])
    await page.getByRole('button', { name: 'Join the study' }).click()
    await page.getByRole('heading', { name: DEMO_STUDY.title }).first().waitFor()
    const nav = page.getByRole('navigation', { name: 'Main' })
    expect(await nav.getByText('Team', { exact: true }).isVisible()).toBe(true)
    expect(await nav.getByText('Audit trail').isVisible()).toBe(false)
    await page.close()
  })
})
