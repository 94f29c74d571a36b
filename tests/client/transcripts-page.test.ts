import { afterEach, describe, expect, it, vi } from 'vitest'
import type { TranscriptSummary } from '@shared/schemas/interviews'
import TranscriptsView from '@/views/transcripts/TranscriptsView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const summary = (over: Partial<TranscriptSummary>): TranscriptSummary => ({
  id: 't-1',
  interviewId: 'i-1',
  participantId: 'p-1',
  pseudonym: 'P01',
  interviewDate: '2026-04-02',
  version: 1,
  status: 'approved',
  format: 'text',
  wordCount: 1200,
  createdAt: '2026-04-03T10:00:00Z',
  ...over,
})

async function mountPage(role: 'coder' | 'coordinator', transcripts: TranscriptSummary[]) {
  stubFetch({ 'GET /api/studies/study-1/transcripts': { status: 200, body: { transcripts } } })
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(TranscriptsView, { app, path: '/studies/study-1/transcripts' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading the transcripts"]').exists()).toBe(false)
  })
  return wrapper
}

describe('the transcripts page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('tells a coder who sees none who uploads and approves them', async () => {
    const wrapper = await mountPage('coder', [])
    expect(wrapper.text()).toContain('No approved transcripts yet')
    expect(wrapper.text()).toContain('The coordinator uploads and approves them.')
    expect(wrapper.text()).not.toContain('Anonymisation log')
  })

  it('links approved transcripts to reading and ones in review to the review, with the status in words', async () => {
    const wrapper = await mountPage('coordinator', [summary({}), summary({ id: 't-2', pseudonym: 'P02', status: 'in_review' })])
    expect(wrapper.find('a[href="/studies/study-1/transcripts/t-1"]').exists()).toBe(true)
    expect(wrapper.find('a[href="/studies/study-1/transcripts/t-2/review"]').exists()).toBe(true)
    expect(wrapper.text()).toContain('Approved for coding')
    expect(wrapper.text()).toContain('Being de-identified')
    expect(wrapper.find('a[href="/studies/study-1/anonymisation-log"]').exists()).toBe(true)
  })
})
