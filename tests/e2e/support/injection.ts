import type { Page } from 'playwright-core'

/**
 * Script-injection payloads and the checks a page must pass with them on screen
 * (security.md test 53; ASVS 5.0 3.2.2, 1.2.1; WSTG-INPV-02, WSTG-CLNT-03).
 *
 * Every payload carries its field's marker (e.g. "F07"): if one ever runs, `window.__xss` names the
 * field, and if one is ever parsed as markup, the element it made names the field too.
 */

/** Each kind of payload, for one marker. The markup kinds would run under `v-html` or `innerHTML`. */
export function payloadKinds(id: string): string[] {
  return [
    `${id}<img src=x onerror="window.__xss='${id}'">`,
    `${id}<svg onload="window.__xss='${id}'">`,
    `${id}<script>window.__xss='${id}'</script>`,
    // Vue template injection: only dangerous if text were ever compiled as a template
    `${id}{{constructor.constructor('window.__xss="${id}"')()}}`,
    `${id}</textarea></title><b data-xss="${id}">`,
    `${id}<img src=x onerror=alert('${id}')>`,
    `${id} javascript:window.__xss='${id}'`,
  ]
}

/**
 * As many payload kinds as fit in `max` characters, starting at a kind chosen by the marker so that
 * short fields between them still try every kind. Always at least one kind.
 */
export function payload(id: string, max = 2000): string {
  const kinds = payloadKinds(id)
  const first = Number(id.replace(/\D/g, '')) % kinds.length
  const parts: string[] = []
  for (let i = 0; i < kinds.length; i++) {
    const next = kinds[(first + i) % kinds.length]!
    if (parts.length && [...parts, next].join(' ').length > max) continue
    parts.push(next)
  }
  return parts.join(' ')
}

export interface Guard {
  dialogs: string[]
}

/**
 * Watches a page for script that should never run: every dialog is recorded and dismissed. The
 * Content-Security-Policy header is taken off the app's documents, so the test shows that the client
 * itself renders text as text; the policy is a second line that this test must not lean on.
 */
export async function guard(page: Page): Promise<Guard> {
  const watched: Guard = { dialogs: [] }
  page.on('dialog', (dialog) => {
    watched.dialogs.push(`${dialog.type()}: ${dialog.message()}`)
    void dialog.dismiss()
  })
  // Chromium's own switch, for this page only (a request route would slow every asset down)
  const cdp = await page.context().newCDPSession(page)
  await cdp.send('Page.setBypassCSP', { enabled: true })
  return watched
}

/** What ran or was parsed as markup on the page, named by marker; empty when the page is clean. */
export async function injectionFindings(page: Page, watched: Guard): Promise<string[]> {
  const found = await page.evaluate(() => {
    const w = window as unknown as { __xss?: unknown }
    const out: string[] = []
    if (w.__xss !== undefined) out.push(`script ran: window.__xss = ${String(w.__xss)}`)
    for (const el of Array.from(document.querySelectorAll('[onerror], [onload], [data-xss]'))) out.push(`element made from data: ${el.outerHTML.slice(0, 120)}`)
    for (const el of Array.from(document.querySelectorAll('img[src="x"], svg[onload]'))) out.push(`element made from data: ${el.outerHTML.slice(0, 120)}`)
    for (const script of Array.from(document.querySelectorAll('script'))) if (script.textContent?.includes('__xss')) out.push(`script element made from data: ${script.outerHTML.slice(0, 120)}`)
    for (const a of Array.from(document.querySelectorAll('a[href]'))) if (/^\s*javascript:/i.test(a.getAttribute('href') ?? '')) out.push(`javascript: link: ${a.outerHTML.slice(0, 120)}`)
    return out
  })
  return [...found, ...watched.dialogs.map((d) => `dialog opened: ${d}`)]
}

/** The page's visible text plus the values of its form fields (some text is shown for editing). */
export async function shownText(page: Page): Promise<string> {
  return page.evaluate(() => {
    const values = Array.from(document.querySelectorAll<HTMLInputElement | HTMLTextAreaElement>('input, textarea')).map((field) => field.value)
    return `${document.body.innerText}\n${values.join('\n')}`
  })
}

/** Waits (a few seconds at most) until every one of `wanted` is in the page's shown text; true if so. */
export async function showsAll(page: Page, wanted: string[], timeout = 8000): Promise<boolean> {
  if (!wanted.length) return true
  return page
    .waitForFunction(
      (parts) => {
        const values = Array.from(document.querySelectorAll<HTMLInputElement | HTMLTextAreaElement>('input, textarea')).map((field) => field.value)
        const text = `${document.body.innerText}\n${values.join('\n')}`
        return parts.every((part) => text.includes(part))
      },
      wanted,
      { timeout },
    )
    .then(
      () => true,
      () => false,
    )
}
