import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import type { Server } from 'node:http'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { AxeBuilder } from '@axe-core/playwright'
import { createTestContext, type TestContext } from '../../support/test-app.js'

export const SCREENSHOT_DIR = path.resolve('test-output/e2e')

export interface E2E {
  ctx: TestContext
  baseUrl: string
  browser: BrowserContext
  newPage(): Promise<Page>
  close(): Promise<void>
}

/**
 * Serves the built client and the API from one Express app on a free loopback port (as `npm start`
 * does) and opens Debian's Chromium through playwright-core.
 */
export async function startE2E(): Promise<E2E> {
  const ctx = await createTestContext({ PUBLIC_URL: 'http://127.0.0.1:0' })
  const server = await new Promise<Server>((resolve) => {
    const s = ctx.app.listen(0, '127.0.0.1', () => resolve(s))
  })
  const port = (server.address() as { port: number }).port
  const baseUrl = `http://127.0.0.1:${port}`
  const profile = mkdtempSync(path.join(tmpdir(), 'heardwell-chromium-'))
  const browser = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 860 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  return {
    ctx,
    baseUrl,
    browser,
    /** a page with no cookies, so each journey starts signed out */
    async newPage() {
      await browser.clearCookies()
      const page = await browser.newPage()
      page.setDefaultTimeout(30_000) // generous: the browser shares two cores with the server and PostgreSQL
      return page
    },
    async close() {
      await browser.close()
      await new Promise<void>((resolve) => server.close(() => resolve()))
      await ctx.close()
      rmSync(profile, { recursive: true, force: true })
    },
  }
}

export async function screenshot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: path.join(SCREENSHOT_DIR, `${name}.png`), fullPage: true })
}

/** axe-core scan; returns the serious and critical violations, described for a failure message. */
export async function seriousA11yViolations(page: Page): Promise<string[]> {
  // scan the settled page: an element half-way through a fade has a lower contrast than it will keep.
  // A notification may appear just after the last request ends, so the page must stay still for two
  // looks in a row, 150 ms apart.
  let still = 0
  for (let look = 0; look < 60 && still < 2; look++) {
    const moving = await page.evaluate(
      () =>
        Boolean(document.querySelector('[class*="-transition-enter-active"], [class*="-transition-leave-active"]')) ||
        Array.from(document.querySelectorAll('.v-snackbar__wrapper')).some((w) => (w as HTMLElement).offsetParent !== null && getComputedStyle(w).opacity !== '1'),
    )
    still = moving ? 0 : still + 1
    if (still < 2) await page.waitForTimeout(150)
  }
  const result = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa']).analyze()
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.impact} ${v.id}: ${v.help} — ${v.nodes.map((n) => `${n.target.join(' ')} ${n.html.slice(0, 160)} ${n.failureSummary ?? ''}`).slice(0, 3).join(', ')}`)
}

export async function signIn(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`)
  // a response from an earlier page may have renewed a session cookie after cookies were cleared:
  // if the app still thinks someone is signed in, sign them out first, as a person would
  const ready = await page.getByLabel('E-mail address').waitFor({ timeout: 5000 }).then(() => true, () => false)
  if (!ready) {
    await page.evaluate(async () => {
      const { token } = await (await fetch('/api/auth/csrf')).json()
      await fetch('/api/auth/logout', { method: 'POST', headers: { 'X-CSRF-Token': token } })
    })
    await page.goto(`${baseUrl}/sign-in`)
  }
  await page.getByLabel('E-mail address').fill(email)
  await page.getByLabel('Password', { exact: true }).fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** Signs in and waits until the app has landed on the studies list or a study page. */
export async function signInAndArrive(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await signIn(page, baseUrl, email, password)
  await page.waitForURL((url) => url.pathname === '/' || url.pathname.startsWith('/studies'))
}
