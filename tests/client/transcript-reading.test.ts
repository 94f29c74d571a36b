import { afterEach, describe, expect, it, vi } from 'vitest'
import type { TranscriptReading } from '@shared/schemas/interviews'
import TranscriptReadingView from '@/views/transcripts/TranscriptReadingView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

// The turns are found only through their offsets: the text itself carries no speaker names.
const first = 'Nobody told us what to expect when [NAME-1] came home.'
const second = 'What did you wish you had known?'
const third = 'How tired we would both be.'
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
  wordCount: 27,
  createdAt: '2026-04-03T10:00:00Z',
  text,
  sha256: 'c0ffee'.repeat(10) + 'abcd',
  turns: [
    { speaker: 'Participant', startMs: 65000, start: at(first), end: at(first) + first.length },
    { speaker: 'Interviewer', startMs: 3725000, start: at(second), end: at(second) + second.length },
    { speaker: 'Participant', startMs: null, start: at(third), end: at(third) + third.length },
  ],
}

async function mountReading() {
  const { calls } = stubFetch({ 'GET /api/studies/study-1/transcripts/t-1': { status: 200, body: reading } })
  const app = createTestApp()
  signInAs('coder')
  const { wrapper } = await mountView(TranscriptReadingView, { app, path: '/studies/study-1/transcripts/t-1' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.findAll('.transcript-turn')).toHaveLength(3)
  })
  return { wrapper, calls }
}

describe('the transcript reading view', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('puts each turn’s speaker and time in the left column and its words, cut by the offsets, beside them', async () => {
    const { wrapper } = await mountReading()
    const turns = wrapper.findAll('.transcript-turn')
    expect(turns.map((t) => t.find('.transcript-turn__speaker').text())).toEqual(['Participant', 'Interviewer', 'Participant'])
    expect(turns.map((t) => t.find('.transcript-turn__time').exists() ? t.find('.transcript-turn__time').text() : null)).toEqual(['at 1:05', 'at 1:02:05', null])
    expect(turns.map((t) => t.find('.transcript-turn__words').text())).toEqual([first, second, third])
  })

  it('shows placeholders in their own quiet style', async () => {
    const { wrapper } = await mountReading()
    const placeholders = wrapper.findAll('.transcript-reading-text__placeholder')
    expect(placeholders.map((p) => p.text())).toEqual(['[NAME-1]'])
  })

  it('shows the pseudonym, version, word count and a short SHA-256 in the header', async () => {
    const { wrapper } = await mountReading()
    const header = wrapper.find('header').text()
    expect(header).toContain('Transcript of P03')
    expect(header).toContain('2')
    expect(header).toContain('27')
    expect(header).toContain('c0ffeec0ffee…')
  })

  it('never asks for the identifiable review', async () => {
    const { calls } = await mountReading()
    expect(calls.map((c) => c.url)).toEqual(['/api/studies/study-1/transcripts/t-1'])
    expect(calls.some((c) => c.url.includes('deidentification'))).toBe(false)
  })
})
