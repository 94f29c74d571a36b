import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Flag, TranscriptReview } from '@shared/schemas/interviews'
import TranscriptReviewView from '@/views/transcripts/TranscriptReviewView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const text = 'I looked after Dana at home in Riverton.\n\nThat must have been hard.'
const flag = (over: Partial<Flag>): Flag => ({ id: 'f-1', start: 15, end: 19, category: 'name', text: 'Dana', source: 'scanner', decision: 'pending', ...over })
const review = (flags: Flag[]): TranscriptReview => ({
  id: 't-1',
  interviewId: 'i-1',
  participantId: 'p-1',
  pseudonym: 'P02',
  interviewDate: '2026-04-02',
  version: 1,
  status: 'in_review',
  format: 'text',
  wordCount: 13,
  createdAt: '2026-04-03T10:00:00Z',
  text,
  turns: [
    { speaker: 'Participant', startMs: 5000, start: 0, end: 40 },
    { speaker: 'Interviewer', startMs: 12000, start: 42, end: text.length },
  ],
  flags,
})
const riverton = flag({ id: 'f-2', start: 31, end: 39, category: 'location', text: 'Riverton', decision: 'accepted' })
const PATH = '/api/studies/study-1/transcripts/t-1/deidentification'

async function mountReview(put: { status: number; body: unknown } = { status: 200, body: review([flag({ decision: 'accepted' }), riverton]) }) {
  const { calls } = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'token-1' } },
    [`GET ${PATH}`]: { status: 200, body: review([flag({}), riverton]) },
    [`PUT ${PATH}`]: put,
  })
  stubVisualViewport()
  const app = createTestApp()
  signInAs('coordinator')
  const { wrapper } = await mountView(TranscriptReviewView, { app, path: '/studies/study-1/transcripts/t-1/review' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.text()).toContain('Flags')
  })
  const approve = () => wrapper.findAll('button').find((b) => b.text() === 'Approve')!
  return { wrapper, calls, approve }
}

describe('the de-identification review page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('says plainly at the top that the scan is only an aid', async () => {
    const { wrapper } = await mountReview()
    expect(wrapper.find('.transcript-review-view__caution').text()).toContain('The scan is an aid. It misses things. Read the whole transcript before you approve it.')
  })

  it('keeps Approve disabled while a flag is pending and says why', async () => {
    const { wrapper, approve } = await mountReview()
    expect(approve().attributes('disabled')).toBeDefined()
    expect(wrapper.text()).toContain('1 to decide')
    expect(wrapper.text()).toContain('1 flag still needs a decision')
  })

  it('marks each flag in the text with its category and decision in words', async () => {
    const { wrapper } = await mountReview()
    const marks = wrapper.findAll('mark')
    expect(marks.map((m) => m.text())).toEqual(['DanaName · to decide', 'RivertonPlace · will be replaced'])
  })

  it('saves an accepted flag at once and then lets the transcript be approved', async () => {
    const { wrapper, calls, approve } = await mountReview()
    const accept = wrapper.findAll('button').find((b) => b.attributes('aria-label')?.startsWith('Accept: replace “Dana”'))!
    await accept.trigger('click')
    // Shown at once, before the server answers.
    expect(wrapper.text()).toContain('0 to decide')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    const put = calls.find((c) => c.method === 'PUT')
    expect(JSON.parse(put?.body ?? '{}')).toMatchObject({ decisions: [{ id: 'f-1', decision: 'accepted' }] })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(approve().attributes('disabled')).toBeUndefined()
    })
    expect(wrapper.text()).toContain('0 to decide')
  })

  it('puts a refused decision back and keeps Approve disabled', async () => {
    const { wrapper, approve } = await mountReview({ status: 409, body: { type: 'conflict', title: 'This transcript is approved; its review is closed.', status: 409 } })
    const accept = wrapper.findAll('button').find((b) => b.attributes('aria-label')?.startsWith('Accept: replace “Dana”'))!
    await accept.trigger('click')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('1 to decide')
    })
    expect(approve().attributes('disabled')).toBeDefined()
  })
})
