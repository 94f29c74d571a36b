import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Code } from '@shared/schemas/coding'
import type { Theme } from '@shared/schemas/themes'
import ThemesView from '@/views/themes/ThemesView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const code = (over: Partial<Code> & Pick<Code, 'id' | 'label'>): Code => ({
  parentId: null,
  position: 0,
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  exampleExcerptId: null,
  example: null,
  colour: '#0072B2',
  status: 'active',
  mergedIntoId: null,
  version: 1,
  excerptCount: 0,
  updatedAt: '2026-04-03T10:00:00Z',
  ...over,
})

const theme = (over: Partial<Theme> & Pick<Theme, 'id' | 'name'>): Theme => ({
  parentId: null,
  position: 0,
  description: '',
  plainDescription: '',
  plainGrade: null,
  status: 'draft',
  codeIds: [],
  excerpts: [],
  support: { participants: 0, excerpts: 0 },
  inOpenRound: false,
  version: 1,
  updatedAt: '2026-04-10T10:00:00Z',
  ...over,
})

const codes = [code({ id: 'stairs', label: 'Stairs at home', colour: '#E69F00' }), code({ id: 'leaflets', label: 'Leaflets', colour: '#009E73' })]
// Stored out of order on purpose: the board orders by position, sub-themes under their theme.
const themes = [
  theme({ id: 'help', name: 'Finding help', position: 1, status: 'agreed' }),
  theme({ id: 'stairs-sub', name: 'The stairs as a daily test', parentId: 'home', position: 0, codeIds: ['stairs'], support: { participants: 1, excerpts: 1 } }),
  theme({ id: 'home', name: 'Home is not the same', position: 0, status: 'with_partners', codeIds: ['stairs', 'leaflets'], support: { participants: 7, excerpts: 12 }, version: 4 }),
]

async function mountBoard(role: 'lead' | 'coder', list: Theme[], extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
    'GET /api/studies/study-1/themes': { status: 200, body: { themes: list } },
    'GET /api/studies/study-1/codes': { status: 200, body: { codes } },
    ...extra,
  })
  stubVisualViewport()
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(ThemesView, { app, path: '/studies/study-1/themes' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading the themes"]').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

const button = (label: string) => document.body.querySelector<HTMLButtonElement>(`button[aria-label="${label}"]`)
const handle = (name: string) => document.body.querySelector<HTMLElement>(`[draggable="true"][aria-label="Drag to move “${name}”"]`)
const card = (id: string) => document.body.querySelector<HTMLElement>(`[data-theme-id="${id}"]`)!

/** The test DOM has no DragEvent and lays nothing out: a mouse event carrying stand-in drag data, and a card given a place on screen. */
function dragEvent(type: string, clientY = 0) {
  const event = new MouseEvent(type, { bubbles: true, cancelable: true, clientY })
  const dataTransfer = { effectAllowed: 'all', dropEffect: 'none', setData: vi.fn(), setDragImage: vi.fn() }
  Object.defineProperty(event, 'dataTransfer', { value: dataTransfer })
  return Object.assign(event, { stand: dataTransfer })
}
function placeCard(id: string, top: number): void {
  card(id).getBoundingClientRect = () => ({ x: 0, y: top, top, left: 0, right: 600, bottom: top + 100, width: 600, height: 100, toJSON: () => ({}) })
}
const puts = (calls: { method: string; body?: string }[]) => calls.filter((c) => c.method === 'PUT').map((c) => JSON.parse(c.body!))

describe('the theme overview', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('nests sub-themes under their theme, in order, with status words, codes and support', async () => {
    const { wrapper } = await mountBoard('coder', themes)
    const top = wrapper.findAll('.theme-board > li')
    expect(top.map((li) => li.find('.theme-board-card-name').text())).toEqual(['Home is not the same', 'Finding help'])
    const nested = top[0].findAll('.theme-board-children .theme-board-card-name')
    expect(nested.map((n) => n.text())).toEqual(['Sub-theme: The stairs as a daily test'])
    const home = wrapper.find('[data-theme-id="home"]')
    expect(home.find('.theme-board-card-status').text()).toBe('With partners')
    expect(home.find('.theme-board-card-support').text()).toBe('12 excerpts from 7 participants')
    expect(home.findAll('.theme-board-card-codes li').map((li) => li.text())).toEqual(['Stairs at home', 'Leaflets'])
    expect(home.find('.codebook-code-chip-swatch').attributes('style')).toContain('background: #E69F00')
    expect(wrapper.find('[data-theme-id="stairs-sub"] .theme-board-card-support').text()).toBe('1 excerpt from 1 participant')
    expect(wrapper.find('[data-theme-id="help"] .theme-board-card-status').text()).toBe('Agreed')
    // A coder reads; nothing to change.
    expect(wrapper.text()).toContain('You can read the themes')
    expect(button('Edit “Home is not the same”')).toBeNull()
    expect(button('Move down: “Home is not the same”')).toBeNull()
  })

  it('sends the whole order when the lead moves a theme down or makes it a sub-theme', async () => {
    const { calls } = await mountBoard('lead', themes, { 'PUT /api/studies/study-1/themes/order': { status: 200, body: { themes } } })
    expect(button('Move up: “Home is not the same”')!.disabled).toBe(true)
    // A theme with sub-themes of its own cannot go under another.
    expect(button('Make it a sub-theme of the theme above: “Home is not the same”')!.disabled).toBe(true)
    button('Move down: “Home is not the same”')!.click()
    await vi.waitFor(() => expect(calls.filter((c) => c.method === 'PUT')).toHaveLength(1))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!)).toEqual({
      order: [
        { id: 'help', parentId: null, position: 0 },
        { id: 'home', parentId: null, position: 1 },
        { id: 'stairs-sub', parentId: 'home', position: 0 },
      ],
    })
    await flushPromises()
    button('Make it a sub-theme of the theme above: “Finding help”')!.click()
    await vi.waitFor(() => expect(calls.filter((c) => c.method === 'PUT')).toHaveLength(2))
    expect(JSON.parse(calls.filter((c) => c.method === 'PUT')[1].body!)).toEqual({
      order: [
        { id: 'home', parentId: null, position: 0 },
        { id: 'stairs-sub', parentId: 'home', position: 0 },
        { id: 'help', parentId: 'home', position: 1 },
      ],
    })
  })

  it('lifts a sub-theme out to sit right after its theme', async () => {
    const { calls } = await mountBoard('lead', themes, { 'PUT /api/studies/study-1/themes/order': { status: 200, body: { themes } } })
    button('Make it a theme of its own: “The stairs as a daily test”')!.click()
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!).order).toEqual([
      { id: 'home', parentId: null, position: 0 },
      { id: 'stairs-sub', parentId: null, position: 1 },
      { id: 'help', parentId: null, position: 2 },
    ])
  })

  it('sends the whole order when the lead drags a theme to after another', async () => {
    const { wrapper, calls } = await mountBoard('lead', themes, { 'PUT /api/studies/study-1/themes/order': { status: 200, body: { themes } } })
    placeCard('help', 300)
    const start = dragEvent('dragstart')
    handle('Home is not the same')!.dispatchEvent(start)
    // The whole card follows the pointer, not just its handle.
    expect(start.stand.effectAllowed).toBe('move')
    expect(start.stand.setDragImage).toHaveBeenCalledWith(card('home'), 24, 24)
    await flushPromises()
    expect(card('home').classList).toContain('theme-board-dragged')
    // Near the bottom edge of "Finding help": a line after it, not the highlight for going inside.
    const over = dragEvent('dragover', 390)
    card('help').dispatchEvent(over)
    expect(over.defaultPrevented).toBe(true)
    await flushPromises()
    const helpItem = wrapper.findAll('.theme-board > li')[1]
    expect(helpItem.classes()).toContain('theme-board-drop-after')
    expect(card('help').classList).not.toContain('theme-board-drop-inside')
    card('help').dispatchEvent(dragEvent('drop', 390))
    await vi.waitFor(() => expect(puts(calls)).toHaveLength(1))
    // The theme moves with its sub-theme, exactly as the move-down button sends it.
    expect(puts(calls)[0]).toEqual({
      order: [
        { id: 'help', parentId: null, position: 0 },
        { id: 'home', parentId: null, position: 1 },
        { id: 'stairs-sub', parentId: 'home', position: 0 },
      ],
    })
    await flushPromises()
    expect(helpItem.classes()).not.toContain('theme-board-drop-after')
  })

  it('makes a theme a sub-theme when the lead drops it on the middle of a top-level theme', async () => {
    const { calls } = await mountBoard('lead', themes, { 'PUT /api/studies/study-1/themes/order': { status: 200, body: { themes } } })
    placeCard('home', 100)
    handle('Finding help')!.dispatchEvent(dragEvent('dragstart'))
    card('home').dispatchEvent(dragEvent('dragover', 150))
    await flushPromises()
    expect(card('home').classList).toContain('theme-board-drop-inside')
    card('home').dispatchEvent(dragEvent('drop', 150))
    await vi.waitFor(() => expect(puts(calls)).toHaveLength(1))
    expect(puts(calls)[0]).toEqual({
      order: [
        { id: 'home', parentId: null, position: 0 },
        { id: 'stairs-sub', parentId: 'home', position: 0 },
        { id: 'help', parentId: 'home', position: 1 },
      ],
    })
  })

  it('refuses drops that break the two levels or go into the theme itself', async () => {
    const { wrapper, calls } = await mountBoard('lead', themes, { 'PUT /api/studies/study-1/themes/order': { status: 200, body: { themes } } })
    placeCard('help', 300)
    placeCard('stairs-sub', 200)
    // "Home is not the same" has a sub-theme: the middle of another theme only places it before or after.
    handle('Home is not the same')!.dispatchEvent(dragEvent('dragstart'))
    card('help').dispatchEvent(dragEvent('dragover', 350))
    await flushPromises()
    expect(card('help').classList).not.toContain('theme-board-drop-inside')
    expect(wrapper.findAll('.theme-board > li')[1].classes()).toContain('theme-board-drop-after')
    // Its own sub-theme is inside it: no landing there at all.
    const intoItself = dragEvent('dragover', 290)
    card('stairs-sub').dispatchEvent(intoItself)
    expect(intoItself.defaultPrevented).toBe(false)
    card('stairs-sub').dispatchEvent(dragEvent('drop', 290))
    // Dropped on its own card: nothing moves.
    handle('Finding help')!.dispatchEvent(dragEvent('dragstart'))
    card('help').dispatchEvent(dragEvent('drop', 350))
    await flushPromises()
    expect(puts(calls)).toHaveLength(0)
  })

  it('gives read-only coders nothing to drag', async () => {
    await mountBoard('coder', themes)
    expect(card('home')).not.toBeNull()
    expect(document.body.querySelectorAll('[draggable="true"]')).toHaveLength(0)
    expect(document.body.querySelector('[aria-label^="Drag to move"]')).toBeNull()
    // A drag from elsewhere lands nowhere on the board.
    const over = dragEvent('dragover', 50)
    card('home').dispatchEvent(over)
    expect(over.defaultPrevented).toBe(false)
  })

  it('asks once before deleting, sends the version and shows why a theme in an open round stays', async () => {
    const detail = 'This theme is in the open review round “Spring round”. Close the round before deleting it.'
    const { calls } = await mountBoard('lead', themes, {
      'DELETE /api/studies/study-1/themes/home': { status: 409, body: { type: 'conflict', title: 'In an open round', status: 409, detail } },
    })
    button('Delete “Home is not the same”')!.click()
    await flushPromises()
    await vi.waitFor(() => expect(document.body.textContent).toContain('Delete “Home is not the same”?'))
    expect(calls.some((c) => c.method === 'DELETE')).toBe(false)
    ;[...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Delete theme')!.click()
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'DELETE')).toBe(true))
    expect(calls.find((c) => c.method === 'DELETE')!.url).toBe('/api/studies/study-1/themes/home?version=4')
    const { useNotificationsStore } = await import('@/stores/notifications')
    await vi.waitFor(() => expect(useNotificationsStore().queue.map((n) => n.text)).toContain(detail))
  })

  it('says what to do when there are no themes yet', async () => {
    const { wrapper } = await mountBoard('lead', [])
    expect(wrapper.text()).toContain('No themes yet: group codes into a first theme.')
    expect(wrapper.text()).toContain('Partners see only the excerpts you share with them')
  })
})
