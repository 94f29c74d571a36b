import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Memo } from '@shared/schemas/coding'
import MemoThread from '@/components/coding/MemoThread.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const memo = (over: Partial<Memo>): Memo => ({
  id: 'm-1',
  targetType: 'code',
  targetId: 'code-1',
  targetLabel: 'Code: Stairs',
  transcriptId: null,
  body: 'Stairs come up in almost every interview.',
  authorId: 'user-1',
  authorName: 'Sam Example',
  version: 1,
  createdAt: '2026-04-03T10:00:00Z',
  updatedAt: '2026-04-03T10:00:00Z',
  ...over,
})

async function mountThread(memos: Memo[], extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({
    'GET /api/studies/study-1/memos': { status: 200, body: { memos } },
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
    ...extra,
  })
  const app = createTestApp()
  signInAs('coder')
  const { wrapper } = await mountView(MemoThread, { app, props: { studyId: 'study-1', targetType: 'code', targetId: 'code-1' } })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading the memos"]').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

describe('the memo thread', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows a memo body with markup as plain text and keeps its line breaks', async () => {
    const { wrapper } = await mountThread([memo({ body: '<script>alert(1)</script>\n<b>second line</b>' })])
    const body = wrapper.find('.memo-card-body')
    expect(body.element.textContent).toBe('<script>alert(1)</script>\n<b>second line</b>')
    expect(body.element.querySelector('script')).toBeNull()
    expect(body.element.querySelector('b')).toBeNull()
  })

  it('asks for the memos of its target and lists them newest first', async () => {
    const { wrapper, calls } = await mountThread([
      memo({ id: 'old', body: 'First thought', createdAt: '2026-04-01T09:00:00Z', updatedAt: '2026-04-01T09:00:00Z' }),
      memo({ id: 'new', body: 'Later thought', createdAt: '2026-04-05T09:00:00Z', updatedAt: '2026-04-05T09:00:00Z' }),
    ])
    const url = new URL(calls.find((c) => c.url.startsWith('/api/studies/study-1/memos'))!.url, 'http://x')
    expect(url.searchParams.get('targetType')).toBe('code')
    expect(url.searchParams.get('targetId')).toBe('code-1')
    expect(wrapper.findAll('.memo-card-body').map((b) => b.text())).toEqual(['Later thought', 'First thought'])
  })

  it('offers change and remove only on the person’s own memos', async () => {
    const { wrapper } = await mountThread([memo({ id: 'mine' }), memo({ id: 'theirs', authorId: 'user-2', authorName: 'Another Coder', createdAt: '2026-04-02T10:00:00Z' })])
    const cards = wrapper.findAll('article.memo-card')
    expect(cards[0].text()).toContain('Change')
    expect(cards[1].text()).toContain('Another Coder')
    expect(cards[1].text()).not.toContain('Change')
  })

  it('sends the version with a change and shows the server’s message when it is stale', async () => {
    const { wrapper, calls } = await mountThread([memo({ version: 4 })], {
      'PATCH /api/studies/study-1/memos/m-1': { status: 409, body: { type: 'conflict', title: 'Conflict', status: 409, detail: 'Someone changed this memo since you opened it.' } },
    })
    await wrapper.findAll('button').find((b) => b.text() === 'Change')!.trigger('click')
    await flushPromises()
    await wrapper.find('article textarea').setValue('A clearer thought')
    await wrapper.find('article form').trigger('submit')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PATCH')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PATCH')!.body!)).toEqual({ version: 4, body: 'A clearer thought' })
    const { useNotificationsStore } = await import('@/stores/notifications')
    await vi.waitFor(() => expect(useNotificationsStore().queue.map((n) => n.text)).toContain('Someone changed this memo since you opened it.'))
  })
})
