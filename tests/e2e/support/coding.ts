import type { Page } from 'playwright-core'

/** Selects `passage` in the reading text as a mouse drag would, and lets the view see the selection. */
export async function select(page: Page, passage: string): Promise<void> {
  await page.evaluate((wanted) => {
    const root = document.querySelector('[data-testid="coding-text"]')!
    const walker = document.createTreeWalker(root, NodeFilter.SHOW_TEXT)
    for (let node = walker.nextNode(); node; node = walker.nextNode()) {
      const at = node.textContent!.indexOf(wanted)
      if (at < 0) continue
      const range = document.createRange()
      range.setStart(node, at)
      range.setEnd(node, at + wanted.length)
      const selection = document.getSelection()!
      selection.removeAllRanges()
      selection.addRange(range)
      node.parentElement!.dispatchEvent(new MouseEvent('mouseup', { bubbles: true }))
      return
    }
    throw new Error(`passage not found in one text node: ${wanted}`)
  }, passage)
}
