import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Code } from '@shared/schemas/coding'
import CodebookView from '@/views/coding/CodebookView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

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

// The invented demo study "Coming Home After Stroke".
const codes: Code[] = [
  code({ id: 'home', label: 'Living at home', position: 0, colour: '#009E73', excerptCount: 7, definition: 'Daily life after discharge.' }),
  code({ id: 'bathroom', label: 'Bathroom', parentId: 'home', position: 0, excerptCount: 2 }),
  code({ id: 'stairs', label: 'Stairs', parentId: 'home', position: 1, version: 3, colour: '#E69F00', excerptCount: 5 }),
  code({ id: 'info', label: 'Information at discharge', position: 1, status: 'retired' }),
  code({ id: 'tired', label: 'Tiredness', position: 2, status: 'merged', mergedIntoId: 'home' }),
]

async function mountCodebook(role: 'coder' | 'coordinator', extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({
    'GET /api/studies/study-1/codes': { status: 200, body: { codes } },
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
    ...extra,
  })
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(CodebookView, { app, path: '/studies/study-1/codebook' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading the codebook"]').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

describe('the codebook tree', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('nests child codes inside their parent, in order, with colour names, status and excerpt counts', async () => {
    const { wrapper } = await mountCodebook('coder')
    const home = wrapper.find('#codebook-code-home').element.closest('li')!
    const nested = [...home.querySelectorAll(':scope > ul > li > .codebook-tree-row .codebook-tree-row-label')].map((el) => el.textContent)
    expect(nested).toEqual(['Bathroom', 'Stairs'])
    const row = wrapper.find('#codebook-code-stairs').text()
    expect(row).toContain('Orange')
    expect(row).toContain('5 excerpts')
    expect(wrapper.find('#codebook-code-info').text()).toContain('Retired')
    expect(wrapper.find('#codebook-code-tired').text()).toContain('merged into “Living at home”')
    expect(wrapper.find('#codebook-code-home').text()).toContain('Daily life after discharge.')
  })

  it('moves a code up with its version, its parent and its new position', async () => {
    const moved = codes.map((c) => (c.id === 'stairs' ? { ...c, position: 0, version: 4 } : c.id === 'bathroom' ? { ...c, position: 1 } : c))
    const { wrapper, calls } = await mountCodebook('coder', { 'PUT /api/studies/study-1/codes/stairs/position': { status: 200, body: { codes: moved } } })
    await wrapper.find('button[aria-label="Move “Stairs” up"]').trigger('click')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    const put = calls.find((c) => c.method === 'PUT')!
    expect(JSON.parse(put.body!)).toEqual({ version: 3, parentId: 'home', position: 0 })
  })

  it('puts a code under the code above it, at the end of that code’s children', async () => {
    const { wrapper, calls } = await mountCodebook('coder', { 'PUT /api/studies/study-1/codes/info/position': { status: 200, body: { codes } } })
    await wrapper.find('button[aria-label="Put “Information at discharge” under “Living at home”"]').trigger('click')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!)).toEqual({ version: 1, parentId: 'home', position: 2 })
  })

  it('moves a child out to its parent’s level, just after the parent', async () => {
    const { wrapper, calls } = await mountCodebook('coder', { 'PUT /api/studies/study-1/codes/bathroom/position': { status: 200, body: { codes } } })
    await wrapper.find('button[aria-label="Move “Bathroom” out to the top level"]').trigger('click')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!)).toEqual({ version: 1, parentId: null, position: 1 })
  })

  it('shows the server’s message when a move is refused as stale', async () => {
    const { wrapper } = await mountCodebook('coder', {
      'PUT /api/studies/study-1/codes/stairs/position': { status: 409, body: { type: 'conflict', title: 'Conflict', status: 409, detail: 'Someone changed “Stairs” a moment ago. The codebook is reloaded.' } },
    })
    await wrapper.find('button[aria-label="Move “Stairs” up"]').trigger('click')
    const { useNotificationsStore } = await import('@/stores/notifications')
    await vi.waitFor(() => expect(useNotificationsStore().queue.map((n) => n.text)).toContain('Someone changed “Stairs” a moment ago. The codebook is reloaded.'))
  })

  it('offers no move buttons on a merged code, and none at all to someone who cannot change the codebook', async () => {
    const { wrapper } = await mountCodebook('coder')
    expect(wrapper.find('#codebook-code-tired [data-move]').exists()).toBe(false)
    expect(wrapper.find('button[aria-label="Move “Bathroom” up"]').attributes('disabled')).toBeDefined()
    document.body.innerHTML = ''
    vi.unstubAllGlobals()
    const reader = await mountCodebook('coordinator')
    expect(reader.wrapper.find('[data-move]').exists()).toBe(false)
    expect(reader.wrapper.text()).not.toContain('Add code')
  })

  it('says what to do when the codebook is empty', async () => {
    stubFetch({ 'GET /api/studies/study-1/codes': { status: 200, body: { codes: [] } } })
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(CodebookView, { app, path: '/studies/study-1/codebook' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('No codes yet: add your first code, or import a codebook from a CSV file.')
    })
  })
})
