import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Code, Excerpt, ExcerptList } from '@shared/schemas/coding'
import type { TranscriptReading } from '@shared/schemas/interviews'
import type { StudyRole } from '@shared/permissions'
import CodingView from '@/views/coding/CodingView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const text = 'When she came home I did everything for her.\n\nLater we learned to share the jobs.'
const at = (part: string) => text.indexOf(part)
const reading: TranscriptReading = {
  id: 't-1',
  interviewId: 'i-1',
  participantId: 'p-1',
  pseudonym: 'P05',
  interviewDate: '2026-04-02',
  version: 1,
  status: 'approved',
  format: 'text',
  wordCount: 17,
  createdAt: '2026-04-03T10:00:00Z',
  text,
  sha256: 'cd'.repeat(32),
  // the second sentence lies outside every turn, and must still be shown
  turns: [{ speaker: 'Participant', startMs: 0, start: 0, end: at('Later') - 2 }],
}
const fatigue: Code = {
  id: '20000000-0000-4000-8000-000000000001',
  parentId: null,
  position: 0,
  label: 'Taking over care',
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  exampleExcerptId: null,
  example: null,
  colour: '#D55E00',
  status: 'active',
  mergedIntoId: null,
  version: 1,
  excerptCount: 2,
  updatedAt: '2026-04-04T10:00:00Z',
}
const OTHER = '30000000-0000-4000-8000-000000000002'
const excerpt = (id: string, part: string, coderId: string, coderName: string): Excerpt => ({
  id,
  transcriptId: 't-1',
  coderId,
  coderName,
  start: at(part),
  end: at(part) + part.length,
  text: part,
  codeIds: [fatigue.id],
  version: 1,
  createdAt: '2026-04-05T10:00:00Z',
  updatedAt: '2026-04-05T10:00:00Z',
})
const coders = [
  { id: 'user-1', name: 'Sam Example', excerptCount: 1 },
  { id: OTHER, name: 'Robin Example', excerptCount: 1 },
]
const BASE = '/api/studies/study-1'

async function mountCompare(role: StudyRole, own: ExcerptList, theirs?: ExcerptList, settings?: { coderComparison: boolean }) {
  const { calls } = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'token-1' } },
    [`GET ${BASE}/transcripts/t-1`]: { status: 200, body: reading },
    [`GET ${BASE}/codes`]: { status: 200, body: { codes: [fatigue] } },
    [`GET ${BASE}/transcripts/t-1/excerpts`]: { status: 200, body: own },
    ...(settings
      ? {
          [`GET ${BASE}/coding-settings`]: { status: 200, body: settings },
          [`PUT ${BASE}/coding-settings`]: { status: 200, body: { coderComparison: !settings.coderComparison } },
        }
      : {}),
  })
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(CodingView, { app, path: '/studies/study-1/transcripts/t-1/coding' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.findAll('[data-testid="coding-turn"]')).toHaveLength(2)
  })
  if (theirs) {
    // the other coder's list is asked for with ?coderId=, which the stub routes by path alone
    const fetchStub = vi.mocked(globalThis.fetch)
    const original = fetchStub.getMockImplementation()!
    fetchStub.mockImplementation(async (input, init) => {
      if (!String(input).includes(`coderId=${OTHER}`)) return original(input, init)
      calls.push({ url: String(input), method: init?.method ?? 'GET', headers: {} })
      return new Response(JSON.stringify(theirs), { status: 200, headers: { 'Content-Type': 'application/json' } })
    })
  }
  return { wrapper, calls }
}

describe('comparing coding', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows text that falls outside the turns', async () => {
    const { wrapper } = await mountCompare('coder', { excerpts: [], coders: [], comparisonAllowed: false })
    const turns = wrapper.findAll('[data-testid="coding-turn"]')
    expect(turns[1]!.find('.coding-text-turn__words').text()).toBe('Later we learned to share the jobs.')
    expect(turns[1]!.find('.coding-text-turn__speaker').text()).toBe('Outside the turns')
  })

  it('shows another coder’s excerpts beside your own, dashed and read only, when the study allows it', async () => {
    const mine = excerpt('e-mine', 'I did everything', 'user-1', 'Sam Example')
    const theirs = excerpt('e-theirs', 'did everything for her', OTHER, 'Robin Example')
    const { wrapper, calls } = await mountCompare('coder', { excerpts: [mine], coders, comparisonAllowed: true }, { excerpts: [theirs], coders, comparisonAllowed: true })
    const select = await vi.waitFor(() => {
      const found = wrapper.findComponent({ name: 'VSelect' })
      expect(found.exists()).toBe(true)
      return found
    }, { timeout: 8000 })
    expect(select.props('label')).toBe("Show another coder's coding")
    expect((select.props('items') as { title: string }[]).map((i) => i.title)).toEqual(['Robin Example (1 excerpt)'])
    select.vm.$emit('update:modelValue', OTHER)
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('[data-testid="coding-excerpt-list-other"]').exists()).toBe(true)
      expect(wrapper.findAll('[data-testid="coding-excerpt-list-other"] [data-testid="coding-excerpt"]')).toHaveLength(1)
    })
    expect(calls.some((c) => c.url === `${BASE}/transcripts/t-1/excerpts?coderId=${OTHER}`)).toBe(true)
    const marks = wrapper.findAll('[data-testid="coding-text"] button[data-excerpt]')
    expect(marks.map((m) => m.attributes('aria-label'))).toEqual(['Excerpt coded Taking over care', 'Robin Example’s excerpt coded Taking over care (read only)'])
    expect(marks[1]!.classes()).toContain('coding-mark--other')
    const shared = wrapper.find('[data-testid="coding-text"] [data-ids="e-mine e-theirs"]')
    expect(shared.text()).toBe('did everything')
    expect(shared.attributes('title')).toBe('Coded Taking over care\nRobin Example: Taking over care')
    // theirs can be chosen to look at, but offers no changes
    await wrapper.find('#coding-excerpt-e-theirs button').trigger('click')
    expect(wrapper.find('#coding-excerpt-e-theirs').text()).toContain('Only they can change it.')
    expect(wrapper.find('#coding-excerpt-e-theirs').findAll('button').map((b) => b.text())).not.toContain('Remove')
  })

  it('lets the lead switch comparison on for the study', async () => {
    const { wrapper, calls } = await mountCompare('lead', { excerpts: [], coders: [], comparisonAllowed: false }, undefined, { coderComparison: false })
    const toggle = await vi.waitFor(() => {
      const found = wrapper.findComponent({ name: 'VSwitch' })
      expect(found.exists()).toBe(true)
      return found
    }, { timeout: 8000 })
    expect(wrapper.text()).toContain('Comparison is off for this study')
    toggle.vm.$emit('update:modelValue', true)
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!)).toEqual({ coderComparison: true })
  })

  it('gives a coder no switch, only the plain reason', async () => {
    const { wrapper, calls } = await mountCompare('coder', { excerpts: [], coders: [], comparisonAllowed: false })
    await vi.waitFor(() => expect(wrapper.text()).toContain('Your lead has not switched on comparison for this study.'), { timeout: 8000 })
    expect(wrapper.findComponent({ name: 'VSwitch' }).exists()).toBe(false)
    expect(calls.some((c) => c.url.includes('coding-settings'))).toBe(false)
  })
})
