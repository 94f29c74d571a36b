import { existsSync, readFileSync } from 'node:fs'
import path from 'node:path'
import { gzipSync } from 'node:zlib'
import { describe, expect, it } from 'vitest'

/**
 * Budgets that are not times: the JavaScript a first visit loads (the entry script and what it
 * preloads) stays at or under 250 KB gzip, and every page's own code is a lazy chunk. `npm test`
 * builds the client into TEST_CLIENT_DIST before the tests run.
 */
const dist = path.resolve(process.env.TEST_CLIENT_DIST ?? 'dist')
const built = existsSync(path.join(dist, 'index.html'))
const BUDGET_KB = 250

describe.skipIf(!built)('client budgets', () => {
  const html = built ? readFileSync(path.join(dist, 'index.html'), 'utf8') : ''
  const initial = [...html.matchAll(/<(?:script[^>]*\bsrc|link[^>]*rel="modulepreload"[^>]*\bhref)="(\/assets\/[^"]+\.js)"/g)].map((m) => m[1]!)

  it(`loads at most ${BUDGET_KB} KB of JavaScript (gzip) on a first visit`, () => {
    expect(initial.length).toBeGreaterThan(0)
    const kb = initial.reduce((sum, file) => sum + gzipSync(readFileSync(path.join(dist, file))).length, 0) / 1024
    expect(kb, `initial JavaScript: ${kb.toFixed(1)} KB gzip in ${initial.length} files`).toBeLessThanOrEqual(BUDGET_KB)
  })

  it('keeps every page’s own code out of the first load (lazy route chunks)', () => {
    const routes = readFileSync(path.resolve('src/router/routes.ts'), 'utf8')
    const views = [...routes.matchAll(/component:\s*([^,\n]+)/g)].map((m) => m[1]!.trim())
    expect(views.length).toBeGreaterThan(20)
    expect(views.filter((v) => !/^\(\) => import\('@\/views\/[^']+\.vue'\)$/.test(v))).toEqual([])
    // each view is a file of its own that the entry only refers to, and none is loaded up front
    const entry = initial.map((file) => readFileSync(path.join(dist, file), 'utf8')).join('\n')
    for (const name of ['CodingView', 'CodebookView', 'ReportsView', 'PartnerRoundView', 'TranscriptReviewView']) {
      expect(entry, name).toMatch(new RegExp(`assets/${name}-[\\w-]+\\.js`))
      expect(initial.some((file) => file.includes(`/${name}-`)), name).toBe(false)
    }
  })
})
