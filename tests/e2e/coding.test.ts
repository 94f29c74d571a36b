import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { approvedTranscript } from '../support/interviews.js'
import { Client } from '../support/test-app.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'
import { select } from './support/coding.js'

/**
 * A coder selects a passage, applies two codes, reloads and finds them; the second coder sees none of
 * them until the lead switches comparison on. The transcript carries an emoji and CJK text, so the
 * offsets the browser computes must match the server's. Every word is invented.
 */
let e2e: E2E
let studyId: string
let transcriptId: string
let lead: Client
const PASSAGE = 'the stairs were the hardest part 😀 of coming home'
const SPOKEN = [
  'Interviewer: How did the first week go?',
  `P: Honestly ${PASSAGE}, and my brother in 東京 rang every night.`,
  'Interviewer: Who helped most?',
  'P: The neighbours did, more than anyone.',
].join('\n')

beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test')).studyId
  lead = new Client(e2e.ctx.app)
  const coordinator = new Client(e2e.ctx.app)
  const coder = new Client(e2e.ctx.app)
  await lead.signIn('lead@heardwell.test', DEMO_PASSWORD)
  await coordinator.signIn('coordinator@heardwell.test', DEMO_PASSWORD)
  await coder.signIn('coder1@heardwell.test', DEMO_PASSWORD)
  ;({ transcriptId } = await approvedTranscript(coordinator, lead, studyId, 'Gwen Stairwell', 'gwen.s@example.org', SPOKEN))
  for (const label of ['Stairs and steps', 'Relief at home']) expect((await coder.post(`/api/studies/${studyId}/codes`, { label })).status).toBe(201)
  expect((await lead.put(`/api/studies/${studyId}/coding-settings`, { coderComparison: false })).status).toBe(200)
})
afterAll(() => e2e?.close())

async function chooseCode(page: Page, label: string): Promise<void> {
  const panel = page.getByTestId('coding-apply-panel')
  await panel.getByLabel('Find or create a code').fill(label.slice(0, 6))
  await panel.getByRole('option', { name: label }).click()
}

describe('coding a transcript', () => {
  it('applies two codes to a selected passage, keeps them after a reload, and keeps them from the second coder until comparison is on', async () => {
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, 'coder1@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/transcripts/${transcriptId}/coding`)
    await page.getByTestId('coding-turn').first().waitFor()
    await select(page, PASSAGE)
    await page.getByTestId('coding-apply-panel').waitFor()
    await chooseCode(page, 'Stairs and steps')
    await chooseCode(page, 'Relief at home')
    await screenshot(page, '20-coding-apply-panel')
    await page.getByTestId('coding-apply-panel').getByRole('button', { name: 'Apply' }).click()
    const item = page.getByTestId('coding-excerpt-list').getByTestId('coding-excerpt')
    await item.filter({ hasText: 'Stairs and steps' }).filter({ hasText: 'Relief at home' }).waitFor()

    const stored = await e2e.ctx.dataSource.query(`SELECT start_offset, end_offset, text FROM excerpts WHERE transcript_id = $1`, [transcriptId])
    expect(stored).toHaveLength(1)
    expect(stored[0].text).toBe(PASSAGE) // the browser's UTF-16 offsets and the server's text agree, emoji included
    const reading = (await lead.get(`/api/studies/${studyId}/transcripts/${transcriptId}`)).body.text as string
    expect(reading.slice(stored[0].start_offset, stored[0].end_offset)).toBe(PASSAGE)

    await page.reload()
    await item.filter({ hasText: 'Stairs and steps' }).filter({ hasText: 'Relief at home' }).waitFor()
    await screenshot(page, '21-coding-view')
    expect(await seriousA11yViolations(page)).toEqual([])
    await page.close()

    const second = await e2e.newPage()
    await signInAndArrive(second, e2e.baseUrl, 'coder2@heardwell.test', DEMO_PASSWORD)
    await second.goto(`${e2e.baseUrl}/studies/${studyId}/transcripts/${transcriptId}/coding`)
    await second.getByTestId('coding-turn').first().waitFor()
    await second.getByText(/each coder sees only their own coding|has not switched on comparison/).waitFor()
    expect(await second.getByTestId('coding-excerpt').count()).toBe(0)
    expect(await second.getByText('Stairs and steps').count()).toBe(0)
    await screenshot(second, '22-coding-second-coder')

    expect((await lead.put(`/api/studies/${studyId}/coding-settings`, { coderComparison: true })).status).toBe(200)
    await second.reload()
    await second.getByTestId('coding-turn').first().waitFor()
    await second.locator('.coding-compare-bar__select .v-field').click() // the field, as a person clicks it (its input is a one-character hidden box)
    await second.getByRole('option', { name: /Priya Salden/ }).click()
    await second.getByTestId('coding-excerpt-list-other').getByText('Stairs and steps').waitFor()
    expect(await second.getByTestId('coding-excerpt-list').getByTestId('coding-excerpt').count()).toBe(0) // still none of their own
    await screenshot(second, '23-coding-comparison')
    await second.close()
  })
})
