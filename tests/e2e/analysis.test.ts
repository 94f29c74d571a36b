import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'

/** The lead opens the agreement and saturation views on the demo study (invented data). */
let e2e: E2E
let studyId: string
beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test', undefined, e2e.ctx.storage)).studyId
})
afterAll(() => e2e?.close())

describe('analysis views', () => {
  it('shows agreement per code with its bands, where coders differ, and the saturation assessment', async () => {
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, 'lead@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/agreement`)
    const table = page.getByTestId('agreement-table')
    await table.getByText('Anger and guilt').waitFor()
    expect(await table.locator('tbody tr').count()).toBeGreaterThan(15)
    await page.getByText(/Landis & Koch/).first().waitFor()
    await page.getByText(/Krippendorff/).first().waitFor()
    expect(await page.locator('body').innerText()).not.toMatch(/NaN/)
    await screenshot(page, '24-agreement')
    expect(await seriousA11yViolations(page)).toEqual([])

    await page.goto(`${e2e.baseUrl}/studies/${studyId}/saturation`)
    const result = page.getByTestId('saturation-result')
    await result.waitFor()
    expect(await result.innerText()).toMatch(/saturation|interview/i)
    await page.getByText(/Guest, G\., Namey, E\. & Chen, M\. \(2020\)/).waitFor()
    await page.getByRole('button', { name: /Show the numbers as a table/ }).click()
    await page.getByRole('table').getByText('P01').waitFor()
    await screenshot(page, '25-saturation')
    expect(await seriousA11yViolations(page)).toEqual([])
    await page.close()
  })
})
