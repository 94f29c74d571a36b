import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Code, Excerpt, ExcerptList } from '@shared/schemas/coding'
import type { TranscriptReading } from '@shared/schemas/interviews'
import CodingView from '@/views/coding/CodingView.vue'
import { useNotificationsStore } from '@/stores/notifications'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

/*
 * Offsets are UTF-16 code units (ECMA-262 §6.1.4): the expected values below come from the string
 * methods themselves (indexOf, length), never from the view. The emoji, the decomposed "é"
 * (e + U+0301) and the Han characters make any counting in code points or graphemes show up.
 */
const family = '\u{1F468}\u200D\u{1F469}\u200D\u{1F467}'
const first = 'Dad came home on a Tuesday 😫 and nobody told us what to expect.'
const second = 'What did you wish you had known?'
const third = `That the cafe\u0301 visits would tire him. 爸爸很累。 And that ${family} life changes.`
const text = `${first}\n\n${second}\n\n${third}`
const at = (part: string) => text.indexOf(part)
const reading: TranscriptReading = {
  id: 't-1',
  interviewId: 'i-1',
  participantId: 'p-1',
  pseudonym: 'P03',
  interviewDate: '2026-04-02',
  version: 2,
  status: 'approved',
  format: 'vtt',
  wordCount: 40,
  createdAt: '2026-04-03T10:00:00Z',
  text,
  sha256: 'ab'.repeat(32),
  turns: [
    { speaker: 'Participant', startMs: 65000, start: at(first), end: at(first) + first.length },
    { speaker: 'Interviewer', startMs: 3725000, start: at(second), end: at(second) + second.length },
    { speaker: 'Participant', startMs: null, start: at(third), end: at(third) + third.length },
  ],
}
const ID = { fatigue: '10000000-0000-4000-8000-000000000001', work: '10000000-0000-4000-8000-000000000002', old: '10000000-0000-4000-8000-000000000003' }
const code = (id: string, label: string, colour: string, status: Code['status'] = 'active'): Code => ({
  id,
  parentId: null,
  position: 0,
  label,
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  exampleExcerptId: null,
  example: null,
  colour,
  status,
  mergedIntoId: null,
  version: 1,
  excerptCount: 0,
  updatedAt: '2026-04-04T10:00:00Z',
})
const codes = [code(ID.fatigue, 'Fatigue', '#E69F00'), code(ID.work, 'Returning to work', '#0072B2'), code(ID.old, 'Old routines', '#009E73', 'retired')]
const excerpt = (id: string, part: string, codeIds: string[], over: Partial<Excerpt> = {}): Excerpt => ({
  id,
  transcriptId: 't-1',
  coderId: 'user-1',
  coderName: 'Sam Example',
  start: at(part),
  end: at(part) + part.length,
  text: part,
  codeIds,
  version: 3,
  createdAt: '2026-04-05T10:00:00Z',
  updatedAt: '2026-04-05T10:00:00Z',
  ...over,
})
const list = (excerpts: Excerpt[], over: Partial<ExcerptList> = {}): ExcerptList => ({ excerpts, coders: [], comparisonAllowed: false, ...over })
const BASE = '/api/studies/study-1'

async function mountCoding(options: { excerpts?: ExcerptList | ExcerptList[]; handlers?: Record<string, { status: number; body?: unknown } | { status: number; body?: unknown }[]>; query?: string } = {}) {
  const lists = Array.isArray(options.excerpts) ? options.excerpts : [options.excerpts ?? list([])]
  const { calls } = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'token-1' } },
    [`GET ${BASE}/transcripts/t-1`]: { status: 200, body: reading },
    [`GET ${BASE}/codes`]: { status: 200, body: { codes } },
    [`GET ${BASE}/transcripts/t-1/excerpts`]: lists.map((body) => ({ status: 200, body })),
    ...options.handlers,
  })
  const app = createTestApp()
  signInAs('coder')
  const { wrapper } = await mountView(CodingView, { app, path: `/studies/study-1/transcripts/t-1/coding${options.query ?? ''}` })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.findAll('[data-testid="coding-turn"]')).toHaveLength(3)
    expect(wrapper.text()).not.toContain('Loading your excerpts')
  })
  return { wrapper, calls }
}

/** The text node of the rendered piece holding `offset`, and the offset within it. */
function domPoint(offset: number): [Node, number] {
  const pieces = [...document.querySelectorAll<HTMLElement>('[data-testid="coding-text"] [data-start]')]
  const piece = pieces.find((p) => Number(p.dataset.start) <= offset && offset < Number(p.dataset.start) + p.textContent!.length)!
  return [piece.firstChild!, offset - Number(piece.dataset.start)]
}

async function selectWithMouse(start: [Node, number], end: [Node, number]) {
  const range = document.createRange()
  range.setStart(...start)
  range.setEnd(...end)
  document.getSelection()!.removeAllRanges()
  document.getSelection()!.addRange(range)
  document.querySelector('[data-testid="coding-text"]')!.dispatchEvent(new MouseEvent('mouseup', { bubbles: true }))
  // the code panel is loaded on first use
  await vi.waitFor(() => expect(document.querySelector('[data-testid="coding-apply-panel"]')).not.toBeNull(), { timeout: 8000 })
}

const postedExcerpt = (calls: { method: string; url: string; body?: string }[]) => {
  const call = calls.find((c) => c.method === 'POST' && c.url === `${BASE}/transcripts/t-1/excerpts`)
  return call ? JSON.parse(call.body!) : null
}

describe('the coding view', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('sets each turn with its speaker and h:mm:ss time beside the words', async () => {
    const { wrapper } = await mountCoding()
    const turns = wrapper.findAll('[data-testid="coding-turn"]')
    expect(turns.map((t) => t.find('.coding-text-turn__speaker').text())).toEqual(['Participant', 'Interviewer', 'Participant'])
    expect(turns.map((t) => (t.find('.coding-text-turn__time').exists() ? t.find('.coding-text-turn__time').text() : null))).toEqual(['at 0:01:05', 'at 1:02:05', null])
    expect(turns.map((t) => t.find('.coding-text-turn__words').text())).toEqual([first, second, third])
  })

  it('turns a mouse selection across turns, with emoji, accents and Han characters, into exact UTF-16 offsets and posts them', async () => {
    const { wrapper, calls } = await mountCoding({ handlers: { [`POST ${BASE}/transcripts/t-1/excerpts`]: { status: 201, body: excerpt('e-new', 'nobody', [ID.fatigue]) } } })
    const start = at('😫')
    const end = at('爸爸很累。') + '爸爸很累'.length
    await selectWithMouse(domPoint(start), domPoint(end))
    const panel = wrapper.find('[data-testid="coding-apply-panel"]')
    expect(panel.find('label').text()).toBe('Find or create a code')
    await panel.find('input').setValue('fat')
    const options = panel.findAll('[role="option"]')
    expect(options.map((o) => o.text())).toEqual(['Fatigue', 'Create the code “fat”'])
    await options[0]!.trigger('click')
    await panel.findAll('button').find((b) => b.text() === 'Apply')!.trigger('click')
    await vi.waitFor(() => expect(postedExcerpt(calls)).not.toBeNull())
    expect(postedExcerpt(calls)).toEqual({ start, end, text: text.slice(start, end), codeIds: [ID.fatigue] })
    expect(text.slice(start, end).startsWith('😫 and nobody')).toBe(true)
    expect(text.slice(start, end).endsWith('爸爸很累')).toBe(true)
  })

  it('snaps a selection that cuts an emoji or a combining accent to whole characters', async () => {
    const { wrapper, calls } = await mountCoding({ handlers: { [`POST ${BASE}/transcripts/t-1/excerpts`]: { status: 201, body: excerpt('e-new', 'nobody', [ID.work]) } } })
    // from between the two code units of the family emoji's first person back to the middle of "café"
    const cafe = at('cafe\u0301')
    await selectWithMouse(domPoint(cafe + 4), domPoint(at(family) + 1))
    const panel = wrapper.find('[data-testid="coding-apply-panel"]')
    await panel.find('input').setValue('work')
    await panel.find('input').trigger('keydown', { key: 'Enter' })
    await panel.find('input').trigger('keydown', { key: 'Enter' })
    await vi.waitFor(() => expect(postedExcerpt(calls)).not.toBeNull())
    const body = postedExcerpt(calls)
    expect(body.start).toBe(cafe + 3) // "e" keeps its accent: the start stays before the e
    expect(body.end).toBe(at(family) + family.length)
    expect(body.text).toBe(`e\u0301 visits would tire him. 爸爸很累。 And that ${family}`)
    expect(body.codeIds).toEqual([ID.work])
  })

  it('reads a selection that starts in the speaker column as starting with the turn', async () => {
    const { wrapper } = await mountCoding()
    const gutter = document.querySelectorAll('.coding-text-turn__speaker')[1]!.firstChild!
    await selectWithMouse([gutter, 0], domPoint(at('you wish') + 3))
    expect(wrapper.find('[data-testid="coding-apply-panel"] blockquote').text()).toBe('What did you')
  })

  it('creates a code on the spot, then codes the passage with it', async () => {
    const created = code('10000000-0000-4000-8000-000000000009', 'Night worries', '#56B4E9')
    const { wrapper, calls } = await mountCoding({
      handlers: {
        [`POST ${BASE}/codes`]: { status: 201, body: created },
        [`POST ${BASE}/transcripts/t-1/excerpts`]: { status: 201, body: excerpt('e-new', 'nobody', [created.id]) },
      },
    })
    await selectWithMouse(domPoint(at('nobody')), domPoint(at('nobody') + 6))
    const panel = wrapper.find('[data-testid="coding-apply-panel"]')
    await panel.find('input').setValue('Night worries')
    await panel.findAll('[role="option"]').find((o) => o.text() === 'Create the code “Night worries”')!.trigger('click')
    await panel.findAll('button').find((b) => b.text() === 'Apply')!.trigger('click')
    await vi.waitFor(() => expect(postedExcerpt(calls)).not.toBeNull())
    const codePost = calls.find((c) => c.method === 'POST' && c.url === `${BASE}/codes`)!
    expect(JSON.parse(codePost.body!)).toMatchObject({ label: 'Night worries' })
    expect(postedExcerpt(calls)).toEqual({ start: at('nobody'), end: at('nobody') + 6, text: 'nobody', codeIds: [created.id] })
    expect(calls.indexOf(codePost)).toBeLessThan(calls.findIndex((c) => c.method === 'POST' && c.url.endsWith('/excerpts')))
  })

  it('offers only active codes', async () => {
    const { wrapper } = await mountCoding()
    await selectWithMouse(domPoint(at('Tuesday')), domPoint(at('Tuesday') + 7))
    await wrapper.find('[data-testid="coding-apply-panel"] input').setValue('o')
    const offered = wrapper.findAll('[data-testid="coding-apply-panel"] [role="option"]').map((o) => o.text())
    expect(offered).toContain('Returning to work')
    expect(offered.some((o) => o.includes('Old routines'))).toBe(false)
  })

  it('shows overlapping excerpts as segments that carry both codes, each excerpt named for keyboard and screen readers', async () => {
    const a = excerpt('e-a', 'came home on a Tuesday', [ID.fatigue])
    const b = excerpt('e-b', 'a Tuesday 😫 and nobody', [ID.work, ID.fatigue])
    const { wrapper } = await mountCoding({ excerpts: list([b, a]) })
    const both = wrapper.findAll('[data-testid="coding-text"] [data-ids="e-a e-b"]')
    expect(both.map((s) => s.text())).toEqual(['a Tuesday'])
    expect(both[0]!.attributes('title')).toBe('Coded Fatigue\nCoded Returning to work, Fatigue')
    expect(both[0]!.attributes('style')).toContain('#E69F00')
    expect(both[0]!.attributes('style')).toContain('#0072B2')
    const marks = wrapper.findAll('[data-testid="coding-text"] button[data-excerpt]')
    expect(marks.map((m) => m.attributes('aria-label'))).toEqual(['Excerpt coded Fatigue', 'Excerpt coded Returning to work, Fatigue'])
    // the text itself is whole, with nothing added by the marks
    expect(wrapper.findAll('[data-testid="coding-turn"]')[0]!.find('.coding-text-turn__words').text()).toBe(first)
    // the side list in reading order, with the code labels as text
    const items = wrapper.findAll('[data-testid="coding-excerpt-list"] [data-testid="coding-excerpt"]')
    expect(items.map((i) => i.find('.coding-excerpt__codes').text())).toEqual(['Fatigue', 'Returning to workFatigue'])
  })

  it('chooses the excerpt named in the link', async () => {
    const a = excerpt('e-a', 'came home', [ID.fatigue])
    const b = excerpt('e-b', 'nobody told us', [ID.work])
    const { wrapper } = await mountCoding({ excerpts: list([a, b]), query: '?excerpt=e-b' })
    await vi.waitFor(() => expect(wrapper.find('#coding-excerpt-e-b button').attributes('aria-pressed')).toBe('true'))
    expect(wrapper.find('#coding-excerpt-e-a button').attributes('aria-pressed')).toBe('false')
  })

  it('says plainly when a change was made by someone else (409) and reloads the list', async () => {
    const a = excerpt('e-a', 'came home', [ID.fatigue])
    const { wrapper, calls } = await mountCoding({
      excerpts: [list([a]), list([{ ...a, version: 4 }])],
      handlers: {
        [`PATCH ${BASE}/excerpts/e-a`]: { status: 409, body: { type: '/problems/conflict', title: 'Conflict', status: 409, detail: 'The excerpt changed.' } },
      },
    })
    await wrapper.find('#coding-excerpt-e-a button').trigger('click')
    await wrapper.find('[aria-label="End one word later"]').trigger('click')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PATCH')).toBe(true))
    const patch = calls.find((c) => c.method === 'PATCH')!
    expect(JSON.parse(patch.body!)).toEqual({ version: 3, start: at('came home'), end: at('came home on') + 'came home on'.length, text: 'came home on' })
    const notices = useNotificationsStore()
    await vi.waitFor(() => expect(notices.queue.map((n) => n.text)).toContain('Someone changed this excerpt since you loaded it (perhaps you, in another tab), so it has been reloaded. Check it and make your change again.'))
    await vi.waitFor(() => expect(calls.filter((c) => c.method === 'GET' && c.url.endsWith('/transcripts/t-1/excerpts')).length).toBe(2))
  })

  it('shows the server’s own words when it refuses a passage (422)', async () => {
    const { calls } = await mountCoding({
      handlers: {
        [`POST ${BASE}/transcripts/t-1/excerpts`]: {
          status: 422,
          body: { type: '/problems/validation', title: 'Check the excerpt', status: 422, errors: [{ path: 'text', message: 'The selected text does not match the transcript at these positions.' }] },
        },
      },
    })
    await selectWithMouse(domPoint(at('nobody')), domPoint(at('nobody') + 6))
    const panel = document.querySelector('[data-testid="coding-apply-panel"]')!
    const input = panel.querySelector('input')!
    input.value = 'Fatigue'
    input.dispatchEvent(new Event('input'))
    await flushPromises()
    ;(panel.querySelector('[role="option"]') as HTMLElement).click()
    await flushPromises()
    ;[...panel.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Apply')!.click()
    await vi.waitFor(() => expect(postedExcerpt(calls)).not.toBeNull())
    await vi.waitFor(() => expect(useNotificationsStore().queue.map((n) => n.text)).toContain('The selected text does not match the transcript at these positions.'))
  })

  it('selects the next sentence with the down arrow and opens the panel for it with Enter', async () => {
    const { wrapper } = await mountCoding()
    const textBox = wrapper.find('[data-testid="coding-text"]')
    await textBox.trigger('keydown', { key: 'ArrowDown' })
    await vi.waitFor(() => expect(document.getSelection()!.toString()).toBe(first))
    await textBox.trigger('keydown', { key: 'ArrowDown' })
    await vi.waitFor(() => expect(document.getSelection()!.toString()).toBe(second))
    await textBox.trigger('keydown', { key: 'ArrowDown', shiftKey: true })
    await vi.waitFor(() => expect(document.getSelection()!.toString()).toContain('would tire him.'))
    await textBox.trigger('keydown', { key: 'Enter' })
    await vi.waitFor(() => expect(document.activeElement?.closest('[data-testid="coding-apply-panel"]')).not.toBeNull(), { timeout: 8000 })
    expect(wrapper.find('[data-testid="coding-apply-panel"] blockquote').text()).toBe(`${second}\n\nThat the cafe\u0301 visits would tire him.`)
  })

  it('closes the panel with Escape and gives the focus back to the text', async () => {
    const { wrapper } = await mountCoding()
    await selectWithMouse(domPoint(at('Tuesday')), domPoint(at('Tuesday') + 7))
    await vi.waitFor(() => expect(document.activeElement?.closest('[data-testid="coding-apply-panel"]')).not.toBeNull())
    await wrapper.find('[data-testid="coding-apply-panel"] input').trigger('keydown', { key: 'Escape' })
    await vi.waitFor(() => expect(wrapper.find('[data-testid="coding-apply-panel"]').exists()).toBe(false))
    expect(document.activeElement?.getAttribute('data-testid')).toBe('coding-text')
  })

  it('moves between excerpt marks with E and shows the excerpt in the list with Enter', async () => {
    const a = excerpt('e-a', 'came home', [ID.fatigue])
    const b = excerpt('e-b', 'What did you wish', [ID.work])
    const { wrapper } = await mountCoding({ excerpts: list([a, b]) })
    const textBox = wrapper.find('[data-testid="coding-text"]')
    await textBox.trigger('keydown', { key: 'e' })
    await vi.waitFor(() => expect(document.activeElement?.getAttribute('aria-label')).toBe('Excerpt coded Fatigue'))
    await wrapper.find('[data-excerpt="e-a"]').trigger('keydown', { key: 'e' })
    await vi.waitFor(() => expect(document.activeElement?.getAttribute('aria-label')).toBe('Excerpt coded Returning to work'))
    ;(document.activeElement as HTMLElement).click()
    await vi.waitFor(() => expect(wrapper.find('#coding-excerpt-e-b button').attributes('aria-pressed')).toBe('true'))
    expect(document.activeElement?.closest('#coding-excerpt-e-b')).not.toBeNull()
  })

  it('scrolls to the turn holding the offset in the link', async () => {
    const scrolled: string[] = []
    const original = Element.prototype.scrollIntoView
    Element.prototype.scrollIntoView = function (this: Element) {
      scrolled.push(this.getAttribute('data-block') ?? '')
    }
    try {
      await mountCoding({ query: `?at=${at('cafe')}` })
      await vi.waitFor(() => expect(scrolled).toContain('2'))
      expect(scrolled).not.toContain('0')
    } finally {
      Element.prototype.scrollIntoView = original
    }
  })

  it('opens the memos on the transcript, and on one excerpt, beside the text', async () => {
    const a = excerpt('e-a', 'came home', [ID.fatigue])
    const { wrapper, calls } = await mountCoding({ excerpts: list([a]), handlers: { [`GET ${BASE}/memos`]: { status: 200, body: { memos: [] } } } })
    await wrapper.findAll('button').find((b) => b.text() === 'Memos on this transcript')!.trigger('click')
    // the memo panel is loaded on first use, which takes a moment the first time
    await vi.waitFor(() => expect(calls.some((c) => c.url === `${BASE}/memos?targetType=transcript&targetId=t-1`)).toBe(true), { timeout: 8000 })
    await vi.waitFor(() => expect(wrapper.text()).toContain('Memos on this transcript'))
    await wrapper.findAll('button').find((b) => b.text() === 'Back to the excerpts')!.trigger('click')
    await wrapper.find('#coding-excerpt-e-a button').trigger('click')
    await wrapper.find('#coding-excerpt-e-a').findAll('button').find((b) => b.text() === 'Memo')!.trigger('click')
    await vi.waitFor(() => expect(calls.some((c) => c.url === `${BASE}/memos?targetType=excerpt&targetId=e-a`)).toBe(true))
    await vi.waitFor(() => expect(wrapper.text()).toContain('Coded Fatigue:'))
  })

  it('says plainly when the lead has not switched comparison on', async () => {
    const { wrapper } = await mountCoding()
    await vi.waitFor(() => expect(wrapper.text()).toContain('Your lead has not switched on comparison for this study.'), { timeout: 8000 })
  })

  it('says how to code when there are no excerpts yet', async () => {
    const { wrapper } = await mountCoding()
    expect(wrapper.text()).toContain('No excerpts yet.')
    expect(wrapper.text()).toContain('Select a passage in the text')
  })
})
