import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { linkIn, waitForMail } from '../support/mailbox.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'

/**
 * The coordinator sends an e-consent link; the participant opens it from the e-mail, answers each
 * clause, signs with their typed name, and gets the receipt; the participant is then consented.
 */
let e2e: E2E
let studyId: string
beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test', undefined, e2e.ctx.storage)).studyId
  await e2e.ctx.startMailWorker()
})
afterAll(() => e2e?.close())

describe('electronic consent', () => {
  it('goes from the coordinator’s link to a signed consent with a receipt', async () => {
    const [p11] = await e2e.ctx.dataSource.query(`SELECT p.id, c.email, c.name FROM participants p JOIN participant_contacts c ON c.participant_id = p.id WHERE p.study_id = $1 AND p.pseudonym = 'P11'`, [studyId])
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, 'coordinator@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/participants/${p11.id}`)
    await page.getByRole('button', { name: 'Send an e-consent link' }).click()
    const mail = await waitForMail(p11.email, /Your consent form/)
    await screenshot(page, '12-participant-consent-card')

    await e2e.browser.clearCookies()
    await page.goto(`${e2e.baseUrl}/consent/${linkIn(mail, '/consent')}`)
    await page.getByRole('heading', { name: 'Please read the form' }).waitFor()
    // nothing is pre-selected
    expect(await page.getByRole('radio', { checked: true }).count()).toBe(0)
    await page.getByRole('radiogroup', { name: /audio recorded/ }).getByLabel('Yes').check()
    await page.getByRole('radiogroup', { name: /quoted/ }).getByLabel('No').check()
    await page.getByRole('radiogroup', { name: /future studies/ }).getByLabel('Yes').check()
    await page.getByLabel('Type your full name').fill(p11.name)
    await page.getByLabel('I have read the form and I agree to take part').check()
    await screenshot(page, '13-public-consent-page')
    expect(await seriousA11yViolations(page)).toEqual([])
    await page.getByRole('button', { name: 'Sign' }).click()
    await page.getByRole('heading', { name: 'Thank you. You have signed.' }).waitFor()
    expect(await page.getByText(p11.name).first().isVisible()).toBe(true)
    await screenshot(page, '14-public-consent-signed')

    const receipt = await waitForMail(p11.email, /Your signed consent/)
    expect(receipt.attachments.map((a) => a.filename)).toEqual(['consent-receipt.pdf'])

    await signInAndArrive(page, e2e.baseUrl, 'coordinator@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/participants/${p11.id}`)
    await page.getByText('Signed electronically by the participant', { exact: false }).first().waitFor()
    expect(await page.getByText('Consented', { exact: true }).first().isVisible()).toBe(true)
    await page.close()
  })
})
