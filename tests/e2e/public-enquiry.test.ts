import type { Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD, DEMO_STUDY } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { waitForMail } from '../support/mailbox.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'

/**
 * A person applies on the public study page once as an eligible caregiver and once as someone looking
 * for help with their own care; each sees the right answer page, the coordinator finds both in the
 * participants list with the right statuses, and both acknowledgements reach the (fake) mailbox.
 */
let e2e: E2E
let studyId: string
beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test')).studyId
  await e2e.ctx.startMailWorker()
})
afterAll(() => e2e?.close())

const twoYearsAgo = () => {
  const d = new Date()
  d.setUTCFullYear(d.getUTCFullYear() - 2)
  return d.toISOString().slice(0, 10)
}

async function choose(page: Page, question: string, option: string) {
  await page.getByRole('radiogroup', { name: question }).getByLabel(option, { exact: true }).check()
}

async function apply(page: Page, who: { name: string; email: string; reason: string }, shot: string) {
  await page.goto(`${e2e.baseUrl}/join/${DEMO_STUDY.code.toLowerCase()}`)
  await page.getByRole('heading', { name: DEMO_STUDY.title }).first().waitFor()
  await expect(page.getByText(/does not give medical advice/).first().isVisible()).resolves.toBe(true)
  await choose(page, 'Why are you contacting us?', who.reason)
  await page.getByLabel('How old are you?').fill('52')
  await choose(page, 'Did you care for a relative or partner at home after they had a stroke?', 'Yes')
  await page.getByLabel('When did they come home from hospital?').fill(twoYearsAgo())
  await choose(page, 'Where do you live?', 'Coast')
  await choose(page, 'How are you related to the person who had the stroke?', 'Son or daughter')
  await page.getByLabel('Your name').fill(who.name)
  await page.getByLabel('E-mail address').fill(who.email)
  await page.getByLabel('You may contact me about this study').check()
  if (shot === '08-public-page-eligible') {
    await screenshot(page, '08-public-page-form')
    expect(await seriousA11yViolations(page)).toEqual([])
  }
  await page.getByRole('button', { name: 'Send my answers' }).click()
  await page.getByRole('heading', { name: 'Thank you' }).waitFor()
  await screenshot(page, shot)
  expect(await seriousA11yViolations(page)).toEqual([])
}

describe('the public study page', () => {
  it('answers an eligible person and a help-seeker kindly, and the coordinator finds both', async () => {
    const stamp = Date.now()
    const eligible = { name: 'Orla Tidewater', email: `orla.${stamp}@example.org`, reason: 'I would like to take part in the study' }
    const seeker = { name: 'Bram Hollis', email: `bram.${stamp}@example.org`, reason: 'I am looking for help with my own health or care' }
    const page = await e2e.newPage()

    await apply(page, eligible, '08-public-page-eligible')
    await page.getByText('Someone from the study team will contact you.').waitFor()

    await apply(page, seeker, '09-public-page-help-seeking')
    await page.getByText(/looking for help with your own health or care/).waitFor()
    await page.getByText('Regional stroke support line').waitFor()
    expect(await page.getByText(/own (doctor|care provider)/).first().isVisible()).toBe(true)
    expect(await page.content()).not.toMatch(/help_seeking|not_eligible/)

    await waitForMail(eligible.email, /Thank you for contacting/)
    const care = await waitForMail(seeker.email, /Thank you for contacting/)
    expect(care.text).toMatch(/own doctor, nurse or care provider/)

    await signInAndArrive(page, e2e.baseUrl, 'coordinator@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/participants`)
    const eligibleRow = page.getByRole('row').filter({ hasText: eligible.email })
    const seekerRow = page.getByRole('row').filter({ hasText: seeker.email })
    await eligibleRow.waitFor()
    expect(await eligibleRow.getByText('Eligible', { exact: true }).isVisible()).toBe(true)
    expect(await seekerRow.getByText('Not eligible', { exact: true }).isVisible()).toBe(true)
    expect(await seekerRow.getByText('Looking for own care').isVisible()).toBe(true)
    expect(await eligibleRow.getByText(/^P\d{2}$/).textContent()).toBe('P22')
    expect(await seekerRow.getByText(/^P\d{2}$/).textContent()).toBe('P23')
    await screenshot(page, '10-participants-coordinator')
    expect(await seriousA11yViolations(page)).toEqual([])
    await page.close()
  })

  it('shows the team a recruitment dashboard with the funnel, and a partner sees counts only', async () => {
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, 'partner@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/recruitment`)
    await page.getByText(/Enquired/).first().waitFor()
    await page.waitForTimeout(500) // the chart draws after its lazy module loads
    await screenshot(page, '11-recruitment-dashboard-partner')
    expect(await seriousA11yViolations(page)).toEqual([])
    expect(await page.content()).not.toMatch(/@example\.org|P\d{2}\b/)
    const nav = page.getByRole('navigation', { name: 'Main' })
    expect(await nav.getByText('Participants', { exact: true }).isVisible()).toBe(false)
    await page.close()
  })
})
