import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import Papa from 'papaparse'
import { DEMO_PASSWORD } from '../../server/seed/demo-data.js'
import { seedDemo } from '../../server/seed/demo.js'
import { type E2E, screenshot, seriousA11yViolations, signInAndArrive, startE2E } from './support/browser.js'

/** The lead opens the reports of the demo study and downloads CSVs (invented data). */
let e2e: E2E
let studyId: string
beforeAll(async () => {
  e2e = await startE2E()
  studyId = (await seedDemo(e2e.ctx.dataSource, 'test', undefined, e2e.ctx.storage)).studyId
})
afterAll(() => e2e?.close())

describe('reports', () => {
  it('shows the reports and downloads the recruitment flow and the characteristics as CSV', async () => {
    const page = await e2e.newPage()
    await signInAndArrive(page, e2e.baseUrl, 'lead@heardwell.test', DEMO_PASSWORD)
    await page.goto(`${e2e.baseUrl}/studies/${studyId}/reports`)
    await page.getByTestId('export-recruitment-flow').first().waitFor()
    await screenshot(page, '31-reports')
    expect(await seriousA11yViolations(page)).toEqual([])
    expect(await page.locator('body').innerText()).not.toMatch(/NaN/)

    const [flow] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-recruitment-flow').first().click()])
    const flowRows = Papa.parse<string[]>(readFileSync((await flow.path())!, 'utf8').replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data
    expect(flowRows[0]).toEqual(['row', 'stage', 'reason', 'count'])
    expect(flowRows.filter((r) => r[0] === 'stage')).toHaveLength(6)
    expect(flowRows.find((r) => r[1] === 'Enquired')![3]).toBe('21')

    const [characteristics] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-characteristics').first().click()])
    const rows = Papa.parse<string[]>(readFileSync((await characteristics.path())!, 'utf8').replace(/^\uFEFF/, ''), { skipEmptyLines: true }).data
    expect(rows[0]).toEqual(['characteristic', 'value', 'interviewed_n', 'interviewed_percent', 'consented_n', 'consented_percent'])
    expect(rows.find((r) => r[0] === 'Total')![2]).toBe('13')
    await page.emulateMedia({ media: 'print' })
    await screenshot(page, '32-reports-print')
    await page.close()
  })
})
