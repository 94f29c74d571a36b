import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Memo } from '@shared/schemas/coding'
import MemosView from '@/views/coding/MemosView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const memo = (over: Partial<Memo>): Memo => ({
  id: 'm-1',
  targetType: 'study',
  targetId: null,
  targetLabel: 'Study',
  transcriptId: null,
  body: 'A memo.',
  authorId: 'user-2',
  authorName: 'Robin Coder',
  version: 1,
  createdAt: '2026-04-03T10:00:00Z',
  updatedAt: '2026-04-03T10:00:00Z',
  ...over,
})

const memos: Memo[] = [
  memo({ id: 'm-study', body: 'Early impressions of the study.', createdAt: '2026-04-04T10:00:00Z' }),
  memo({ id: 'm-tr', targetType: 'transcript', targetId: 't-1', targetLabel: 'Transcript of P03', transcriptId: 't-1', createdAt: '2026-04-03T10:00:00Z' }),
  memo({ id: 'm-ex', targetType: 'excerpt', targetId: 'e-9', targetLabel: 'Excerpt in P03', transcriptId: 't-1', createdAt: '2026-04-02T10:00:00Z' }),
  memo({ id: 'm-code', targetType: 'code', targetId: 'c-1', targetLabel: 'Code: Stairs', createdAt: '2026-04-01T10:00:00Z' }),
]

describe('the memos page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('links each memo to what it is about: the coding view, the excerpt in it, or the codebook', async () => {
    stubFetch({ 'GET /api/studies/study-1/memos': { status: 200, body: { memos } } })
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(MemosView, { app, path: '/studies/study-1/memos' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.findAll('article.memo-card')).toHaveLength(4)
    })
    const targets = wrapper.findAll('article.memo-card .memo-target-link').map((el) => [el.text(), el.attributes('href') ?? null])
    expect(targets).toEqual([
      ['Study', null],
      ['Transcript of P03', '/studies/study-1/transcripts/t-1/coding'],
      ['Excerpt in P03', '/studies/study-1/transcripts/t-1/coding?excerpt=e-9'],
      ['Code: Stairs', '/studies/study-1/codebook?code=c-1'],
    ])
  })

  it('asks the server to search the memos once the person stops typing', async () => {
    const { calls } = stubFetch({ 'GET /api/studies/study-1/memos': { status: 200, body: { memos: [] } } })
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(MemosView, { app, path: '/studies/study-1/memos' })
    await flushPromises()
    await wrapper.find('[role="search"] input').setValue('stairs')
    await vi.waitFor(() => expect(calls.some((c) => c.url.includes('q=stairs'))).toBe(true), { timeout: 2000 })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('No memos match')
    })
  })
})
