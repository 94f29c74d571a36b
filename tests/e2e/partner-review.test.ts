import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { waitForMail } from '../support/mailbox.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'

/**
 * The lead opens a review round; the patient partner finds the e-mail in the fake mailbox, signs in,
 * answers two themes; the lead sees the answers. Demo data, every word invented.
 */
let e2e: E2E
let studyId: string
beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test', undefined, e2e.ctx.storage)).studyId
  await e2e.ctx.startMailWorker()
})
afterAll(() => e2e?.close())

describe('patient partner review', () => {
  it('the lead opens a round, the partner answers two themes from the e-mailed link, and the lead reads the answers', async () => {
    const lead = await e2e.newPage()
    await signInAndArrive(lead, e2e.baseUrl, 'lead@heardwell.test', DEMO_PASSWORD)
    await lead.goto(`${e2e.baseUrl}/studies/${studyId}/themes`)
    await lead.getByText('Keeping watch at night').first().waitFor()
    await screenshot(lead, '26-themes')
    expect(await seriousA11yViolations(lead)).toEqual([])
    await lead.goto(`${e2e.baseUrl}/studies/${studyId}/review-rounds`)
    await lead.getByRole('button', { name: 'Open a review round' }).first().click()
    const dialog = lead.getByRole('dialog')
    await dialog.getByLabel('Title').fill('Second look: nights and help')
    await dialog.getByLabel('Keeping watch at night').check()
    await dialog.getByLabel('Nobody to ask').check()
    await dialog.getByLabel('Closing date').fill(new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10))
    await screenshot(lead, '27-round-open')
    await dialog.getByRole('button', { name: 'Open the round' }).click()
    await lead.getByText(/e-mailed/).first().waitFor()

    const mail = await waitForMail('partner@heardwell.test', /Themes to read/, 15_000, `/studies/${studyId}/review/`)
    const link = mail.text.match(/https?:\/\/\S+\/studies\/\S+\/review\/[0-9a-f-]+/)![0]
    const roundPath = new URL(link).pathname
    const partner = await e2e.newPage()
    await signInAndArrive(partner, e2e.baseUrl, 'partner@heardwell.test', DEMO_PASSWORD)
    await partner.goto(`${e2e.baseUrl}${roundPath}`)
    const cards = partner.getByTestId('partner-theme')
    await cards.first().waitFor()
    expect(await cards.count()).toBe(2)
    expect(await seriousA11yViolations(partner)).toEqual([])
    await screenshot(partner, '28-partner-review')
    for (const [i, choice, words] of [[0, 'This rings true', 'Yes, the nights were the hardest.'], [1, 'Something is missing', 'Weekends are missing.']] as const) {
      const card = cards.nth(i)
      await card.getByLabel(choice).check()
      await card.getByLabel('Tell us more (optional)').fill(words)
      await card.getByRole('button', { name: 'Send my answer' }).click()
      await card.getByText(/Sent on/).waitFor()
    }
    await partner.getByText(/answered 2 of 2/).waitFor()
    await screenshot(partner, '29-partner-answered')
    // what a partner can never open, even by typing the address
    for (const page of ['transcripts', 'participants', 'consent', 'themes', 'search', 'memos']) {
      await partner.goto(`${e2e.baseUrl}/studies/${studyId}/${page}`)
      await partner.getByText('This page is not open to you').waitFor()
    }
    const navigation = await partner.getByRole('navigation', { name: 'Main' }).innerText()
    expect(navigation).not.toMatch(/Transcripts|Participants|Codebook|Consent/)

    const roundId = roundPath.split('/').pop()!
    // one browser: the partner's sign-in replaced the lead's session, so the lead signs in again
    await lead.close()
    const back = await e2e.newPage()
    await signInAndArrive(back, e2e.baseUrl, 'lead@heardwell.test', DEMO_PASSWORD)
    await back.goto(`${e2e.baseUrl}/studies/${studyId}/review-rounds/${roundId}`)
    const answers = back.getByTestId('round-answers')
    await answers.getByText('Yes, the nights were the hardest.').waitFor()
    await answers.getByText('Weekends are missing.').waitFor()
    expect(await answers.innerText()).toMatch(/Wren Castellane/)
    await screenshot(back, '30-round-answers')
    expect(await seriousA11yViolations(back)).toEqual([])
  })
})
