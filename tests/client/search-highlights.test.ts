import { afterEach, describe, expect, it, vi } from 'vitest'
import type { SearchHit } from '@shared/schemas/coding'
import SearchView from '@/views/coding/SearchView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const hit = (over: Partial<SearchHit>): SearchHit => ({
  kind: 'excerpt',
  transcriptId: 't-1',
  pseudonym: 'P03',
  start: 1200,
  end: 1290,
  speaker: 'Participant',
  context: 'The stairs were the worst. Nobody told us about stairs <b>at all</b>.',
  highlights: [
    [4, 10],
    [48, 54],
  ],
  excerptId: 'e-1',
  coderName: 'Robin Coder',
  codeIds: ['stairs'],
  ...over,
})

async function mountSearch(path: string, hits: SearchHit[], total = hits.length, truncated = false) {
  const stub = stubFetch({
    'GET /api/studies/study-1/search': { status: 200, body: { hits, total, truncated } },
    'GET /api/studies/study-1/codes': {
      status: 200,
      body: { codes: [{ id: 'stairs', parentId: null, position: 0, label: 'Stairs', definition: '', whenToUse: '', whenNotToUse: '', exampleExcerptId: null, example: null, colour: '#E69F00', status: 'active', mergedIntoId: null, version: 1, excerptCount: 1, updatedAt: '2026-04-03T10:00:00Z' }] },
    },
    'GET /api/studies/study-1/members': { status: 200, body: { members: [] } },
    'GET /api/studies/study-1/transcripts': { status: 200, body: { transcripts: [] } },
    'GET /api/studies/study-1/recruitment-settings': { status: 403, body: { type: 'forbidden', title: 'Forbidden', status: 403 } },
  })
  const app = createTestApp()
  signInAs('coder')
  const { wrapper, router } = await mountView(SearchView, { app, path })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Searching"]').exists()).toBe(false)
  })
  return { wrapper, router, ...stub }
}

describe('the search page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('marks each hit from the server’s offsets, as text, and never renders markup from the text', async () => {
    const { wrapper } = await mountSearch('/studies/study-1/search?q=stairs', [hit({})])
    const context = wrapper.find('.search-hit-context')
    expect(context.findAll('mark').map((m) => m.text())).toEqual(['stairs', 'stairs'])
    expect(context.element.textContent).toBe('The stairs were the worst. Nobody told us about stairs <b>at all</b>.')
    expect(context.element.querySelector('b')).toBeNull()
  })

  it('merges overlapping highlights and ignores offsets outside the context', async () => {
    const { wrapper } = await mountSearch('/studies/study-1/search?q=stair', [hit({ context: 'stairs and more stairs', highlights: [[0, 5], [2, 6], [16, 40], [30, 50]] })])
    expect(wrapper.findAll('.search-hit-context mark').map((m) => m.text())).toEqual(['stairs', 'stairs'])
  })

  it('sends the search from the address, links into the coding view and shows who coded it with which codes', async () => {
    const { wrapper, calls } = await mountSearch('/studies/study-1/search?q=stairs&in=excerpts&codeId=stairs', [hit({}), hit({ kind: 'transcript', excerptId: null, coderName: null, codeIds: [], start: 40 })])
    const url = new URL(calls.find((c) => c.url.startsWith('/api/studies/study-1/search'))!.url, 'http://x')
    expect(Object.fromEntries(url.searchParams)).toEqual({ q: 'stairs', in: 'excerpts', codeId: 'stairs' })
    const links = wrapper.findAll('.search-result-item a').map((a) => a.attributes('href'))
    expect(links).toEqual(['/studies/study-1/transcripts/t-1/coding?excerpt=e-1', '/studies/study-1/transcripts/t-1/coding?at=40'])
    const first = wrapper.findAll('.search-result-item')[0].text()
    expect(first).toContain('excerpt coded by Robin Coder')
    expect(first).toContain('Stairs')
  })

  it('says when only the first hits are shown', async () => {
    const { wrapper } = await mountSearch('/studies/study-1/search?q=stairs', [hit({})], 240, true)
    expect(wrapper.text()).toContain('240 hits, showing the first 1')
  })

  it('puts a new search in the address so it can be shared', async () => {
    const { wrapper, router } = await mountSearch('/studies/study-1/search', [])
    await wrapper.find('input[maxlength="200"]').setValue('  discharge  ')
    await wrapper.find('form').trigger('submit')
    await vi.waitFor(() => expect(router.currentRoute.value.query).toEqual({ q: 'discharge' }))
  })
})
