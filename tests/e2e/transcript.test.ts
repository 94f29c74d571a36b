import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { buildDocx } from '../fixtures/transcripts/docx.js'
import { consentedParticipant, doneInterview } from '../support/interviews.js'
import { Client } from '../support/test-app.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'

/**
 * The coordinator uploads a .docx with planted identifiers, reviews the scanner's flags and approves;
 * a coder then finds only the de-identified text. Every name, place and number here is invented.
 */
let e2e: E2E
let studyId: string
let pseudonym: string
const SECRETS = ['Rowena Fairweather', 'Thistleby', '(604) 555-0187', 'rowena.f@example.org', '9 February 2024']

beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test')).studyId
  const lead = new Client(e2e.ctx.app)
  const coordinator = new Client(e2e.ctx.app)
  await lead.signIn('lead@heardwell.test', DEMO_PASSWORD)
  await coordinator.signIn('coordinator@heardwell.test', DEMO_PASSWORD)
  const [{ id: coordinatorId }] = await e2e.ctx.dataSource.query(`SELECT id FROM users WHERE email = 'coordinator@heardwell.test'`)
  const pid = await consentedParticipant(coordinator, lead, studyId, 'Rowena Fairweather', 'rowena.f@example.org')
  await doneInterview(coordinator, studyId, pid, coordinatorId)
  ;[{ pseudonym }] = await e2e.ctx.dataSource.query('SELECT pseudonym FROM participants WHERE id = $1', [pid])
})
afterAll(() => e2e?.close())

describe('transcript de-identification', () => {
  it('uploads a .docx, reviews the flags, approves, and a coder reads only the de-identified text', async () => {
    const docx = await buildDocx([
      'Interviewer: Thank you for meeting me today.',
      'Rowena Fairweather: When my husband came home to Thistleby on 9 February 2024 nobody explained the tablets.',
      'Interviewer: Who did you contact?',
      'Rowena Fairweather: I called (604) 555-0187 and wrote to rowena.f@example.org from my phone, and waited.',
    ])
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, 'coordinator@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/interviews`)
    await page.getByRole('button', { name: `Upload a transcript of the interview with ${pseudonym}` }).click()
    await page.locator('input[type=file]').setInputFiles({ name: 'interview.docx', mimeType: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document', buffer: docx })
    await page.getByRole('button', { name: 'Upload and scan' }).click()
    await page.waitForURL(/\/review$/)
    await page.getByText(/The scan is an aid/).waitFor()
    await screenshot(page, '15-transcript-review')
    expect(await seriousA11yViolations(page)).toEqual([])
    expect(await page.getByRole('button', { name: 'Approve' }).isDisabled()).toBe(true)
    await page.getByRole('button', { name: 'Accept all remaining' }).click()
    await page.getByRole('button', { name: 'Approve' }).and(page.locator(':not([disabled])')).waitFor()
    await page.getByRole('button', { name: 'Approve' }).click()
    await page.waitForURL(/\/transcripts\/[0-9a-f-]+$/)
    await page.waitForLoadState('networkidle')
    await page.close()
    const coderPage = await e2e.newPage()
    await signInAndArrive(coderPage, e2e.baseUrl, 'coder1@heardwell.test', DEMO_PASSWORD)
    await coderPage.goto(`${e2e.baseUrl}/studies/${studyId}/transcripts`)
    await coderPage.getByRole('link', { name: `Read ${pseudonym}’s transcript, version 1` }).click()
    await coderPage.getByText(/nobody explained the tablets/).waitFor()
    const body = await coderPage.content()
    for (const secret of SECRETS) expect(body).not.toContain(secret)
    expect(body).toMatch(/\[DATE-\d+\]/)
    await screenshot(coderPage, '16-transcript-reading-coder')
    expect(await seriousA11yViolations(coderPage)).toEqual([])
    await coderPage.close()
  })
})
