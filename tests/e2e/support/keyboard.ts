import type { Page } from 'playwright-core'

/**
 * Keyboard reachability (WCAG 2.2 SC 2.1.1 Keyboard, SC 2.4.3 Focus Order): presses Tab from the top
 * of the page (or of the open dialog, which keeps the focus) until focus comes round again and
 * returns every visible control the Tab key never
 * reached, plus anything that looks clickable (a pointer cursor) but cannot take focus at all.
 *
 * Radio buttons count as reached when any radio of their group was, and an item with a negative
 * tabindex counts as reached when the widget around it (a list, a tab list, a grid, or a focusable region
 * that handles its own keys, such as the coding text) was:
 * arrow keys move inside such a widget (WAI-ARIA Authoring Practices, "Keyboard navigation inside
 * components"; Vuetify's lists work this way).
 */
export async function keyboardGaps(page: Page, maxTabs = 400): Promise<string[]> {
  const total = await page.evaluate(() => {
    const interactive = [
      'a[href]',
      'button',
      'input:not([type=hidden])',
      'select',
      'textarea',
      'summary',
      '[role=button]',
      '[role=link]',
      '[role=tab]',
      '[role=checkbox]',
      '[role=switch]',
      '[role=menuitem]',
      '[contenteditable=true]',
    ].join(',')
    const selector = `${interactive},[tabindex]`
    const visible = (el: Element) => {
      const box = el.getBoundingClientRect()
      const style = getComputedStyle(el)
      return box.width > 0 && box.height > 0 && style.visibility !== 'hidden' && style.display !== 'none'
    }
    document.querySelectorAll('[data-kb]').forEach((el) => el.removeAttribute('data-kb'))
    // an open modal dialog holds the focus: only its controls can and should be reached
    const root = document.querySelector('.v-overlay--active[role=dialog] .v-overlay__content') ?? document.body
    let n = 0
    for (const el of Array.from(root.querySelectorAll(selector))) {
      // a negative tabindex on something that is not a control marks a focus target (a heading, main), not a control
      if (Number(el.getAttribute('tabindex')) < 0 && !el.matches(interactive)) continue
      if ((el as HTMLButtonElement).disabled || el.closest('[inert], [aria-hidden="true"]')) continue
      // a Vuetify selection control's input is 1 px and see-through on top of its visible box
      const box = el.matches('input[type=checkbox], input[type=radio]') ? el.closest('.v-selection-control') ?? el : el
      if (!visible(box)) continue
      el.setAttribute('data-kb', String(n++))
    }
    // start the Tab sequence at the top of the document (or of the dialog), as after opening it
    const start = root === document.body ? document.body : (root as HTMLElement)
    const had = start.getAttribute('tabindex')
    start.setAttribute('tabindex', '-1')
    start.focus()
    if (had === null) start.removeAttribute('tabindex')
    else start.setAttribute('tabindex', had)
    window.scrollTo(0, 0)
    return n
  })
  const reached = new Set<string>()
  const radioGroups = new Set<string>()
  let first: string | null = null
  let previous: string | null = null
  for (let i = 0; i < maxTabs; i++) {
    await page.keyboard.press('Tab')
    const at = await page.evaluate(() => {
      const el = document.activeElement
      if (!el || el === document.body) return null
      const marked = el.closest('[data-kb]') ?? el.querySelector('[data-kb]')
      const radio = el.matches('input[type=radio]') ? (el as HTMLInputElement).name : null
      // the focused control and every marked container around it (a list that hands focus to its item)
      const around: string[] = []
      for (let up = marked?.parentElement?.closest('[data-kb]'); up; up = up.parentElement?.closest('[data-kb]')) around.push(up.getAttribute('data-kb')!)
      return { id: marked?.getAttribute('data-kb') ?? `unmarked:${el.tagName}${el.id ? `#${el.id}` : ''}`, radio, around }
    })
    if (process.env.KB_DEBUG) console.log('tab', i, at)
    if (!at) continue
    // a date or time field takes several Tab presses (one per part); the walk ends when focus comes back
    // to where it began from somewhere else
    if (at.id === first && previous !== first) break
    previous = at.id
    first ??= at.id
    reached.add(at.id)
    at.around.forEach((id) => reached.add(id))
    if (at.radio) radioGroups.add(at.radio)
  }
  return page.evaluate(
    ({ reachedIds, groups, count }) => {
      const describe = (el: Element) => {
        const name = el.getAttribute('aria-label') ?? (el as HTMLElement).innerText?.trim().slice(0, 60) ?? ''
        const label = el.id ? document.querySelector(`label[for="${el.id}"]`)?.textContent?.trim() : ''
        return `<${el.tagName.toLowerCase()}${el.getAttribute('type') ? ` type=${el.getAttribute('type')}` : ''}> ${label || name}`.trim()
      }
      const gaps: string[] = []
      for (let i = 0; i < count; i++) {
        const el = document.querySelector(`[data-kb="${i}"]`)
        if (!el || reachedIds.includes(String(i))) continue
        if (el.matches('input[type=radio]') && groups.includes((el as HTMLInputElement).name)) continue
        // gone while the walk ran (a notification that timed out, or is fading out and already inert)
        const box = el.matches('input[type=checkbox], input[type=radio]') ? el.closest('.v-selection-control') ?? el : el
        if (!el.isConnected || box.getBoundingClientRect().width === 0 || el.closest('[inert]')) continue
        if (Number(el.getAttribute('tabindex')) < 0) {
          // a widget that takes focus itself and handles the keys inside (the coding text), or a composite role
          const composite = el.parentElement?.closest('[data-kb], [role=tablist], [role=listbox], [role=list], [role=navigation], [role=grid], [role=tree], [role=radiogroup], [role=menu], [role=menubar], [role=toolbar]')
          const reachedInside = composite && reachedIds.some((id) => composite.contains(document.querySelector(`[data-kb="${id}"]`)))
          if (reachedInside) continue
        }
        gaps.push(`not reached by Tab: ${describe(el)}`)
      }
      // looks clickable, yet neither it nor anything around or inside it can take focus
      const root = document.querySelector('.v-overlay--active[role=dialog] .v-overlay__content') ?? document.body
      for (const el of Array.from(root.querySelectorAll('*'))) {
        if (getComputedStyle(el).cursor !== 'pointer' || el.matches('label, label *') || (el as HTMLElement).tabIndex >= 0) continue
        if (el.closest('[data-kb], [tabindex="-1"], [aria-hidden="true"]') || el.querySelector('[data-kb]')) continue
        const box = el.getBoundingClientRect()
        if (box.width === 0 || box.height === 0) continue
        if (el.parentElement && getComputedStyle(el.parentElement).cursor === 'pointer') continue
        gaps.push(`clickable but not focusable: ${describe(el)} (${el.className.toString().slice(0, 60)})`)
      }
      return gaps
    },
    { reachedIds: [...reached], groups: [...radioGroups], count: total },
  )
}
