import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Code } from '@shared/schemas/coding'
import type { Theme } from '@shared/schemas/themes'
import ThemesView from '@/views/themes/ThemesView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const stairs: Code = {
  id: 'stairs',
  parentId: null,
  position: 0,
  label: 'Stairs at home',
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  exampleExcerptId: null,
  example: null,
  colour: '#E69F00',
  status: 'active',
  mergedIntoId: null,
  version: 1,
  excerptCount: 2,
  updatedAt: '2026-04-03T10:00:00Z',
}

const excerpt = (id: string, text: string, pseudonym: string) => ({
  id,
  transcriptId: `t-${pseudonym}`,
  coderId: 'user-1',
  coderName: 'Sam Example',
  start: 10,
  end: 10 + text.length,
  text,
  codeIds: ['stairs'],
  version: 1,
  createdAt: '2026-04-03T10:00:00Z',
  updatedAt: '2026-04-03T10:00:00Z',
  pseudonym,
})

const home: Theme = {
  id: 'home',
  parentId: null,
  position: 0,
  name: 'Home is not the same',
  description: 'Participants describe the house as changed.',
  plainDescription: '',
  plainGrade: null,
  status: 'draft',
  codeIds: ['stairs'],
  excerpts: [
    { excerptId: 'ex-p03', shareWithPartners: false, text: 'The stairs were a mountain.', pseudonym: 'P03', transcriptId: 't-P03', start: 10, mayShowPartners: false },
    { excerptId: 'ex-p07', shareWithPartners: false, text: 'I slept downstairs for weeks.', pseudonym: 'P07', transcriptId: 't-P07', start: 10, mayShowPartners: true },
  ],
  support: { participants: 2, excerpts: 2 },
  inOpenRound: false,
  version: 3,
  updatedAt: '2026-04-10T10:00:00Z',
}

// Hand-counted: 11 words, 1 sentence, 21 syllables (no-bo-dy, ex-plained, med-i-ca-tion, chang-es, af-ter, hos-pi-tal).
// Kincaid et al. (1975) grade: 0.39 × 11 + 11.8 × 21 / 11 − 15.59 = 11.227 → "Grade 11.2", above 8.
const HARD = 'Nobody explained the medication changes after we went home from hospital.'
// Hand-counted: 6 words, 2 sentences, 6 syllables. Kincaid et al. (1975): 0.39 × 3 + 11.8 × 1 − 15.59 = −2.62 → "Grade -2.6".
const EASY = 'We went home. It was hard.'

async function openEditor(extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
    'GET /api/studies/study-1/themes': { status: 200, body: { themes: [home] } },
    'GET /api/studies/study-1/codes': { status: 200, body: { codes: [stairs] } },
    'GET /api/studies/study-1/excerpts': {
      status: 200,
      body: { excerpts: [excerpt('ex-p03', 'The stairs were a mountain.', 'P03'), excerpt('ex-p07', 'I slept downstairs for weeks.', 'P07'), excerpt('ex-p11', 'We moved the bed.', 'P11')] },
    },
    ...extra,
  })
  stubVisualViewport()
  const app = createTestApp()
  signInAs('lead')
  const { wrapper } = await mountView(ThemesView, { app, path: '/studies/study-1/themes' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(document.body.querySelector('button[aria-label="Edit “Home is not the same”"]')).not.toBeNull()
  })
  document.body.querySelector<HTMLButtonElement>('button[aria-label="Edit “Home is not the same”"]')!.click()
  await vi.waitFor(async () => {
    await flushPromises()
    expect(document.body.querySelectorAll('.theme-excerpt-picker-row')).toHaveLength(3)
  })
  return { wrapper, ...stub }
}

function field(label: string): HTMLInputElement | HTMLTextAreaElement {
  const element = [...document.body.querySelectorAll('label')].find((l) => l.textContent?.trim() === label && l.htmlFor)!
  return document.getElementById(element.htmlFor) as HTMLInputElement | HTMLTextAreaElement
}
async function type(label: string, value: string): Promise<void> {
  const input = field(label)
  input.value = value
  input.dispatchEvent(new Event('input', { bubbles: true }))
  await flushPromises()
}
const row = (excerptId: string) => document.body.querySelector(`.theme-excerpt-picker-row[data-excerpt-id="${excerptId}"]`)!
const shareSwitch = (excerptId: string) => row(excerptId).querySelector<HTMLInputElement>('.v-switch input')!
const useBox = (excerptId: string) => row(excerptId).querySelector<HTMLInputElement>('.v-checkbox input')!
const clickButton = (text: string) => [...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === text)!.click()

describe('editing a theme', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows the reading grade of the plain-language description as it is typed, and saves with the version', async () => {
    const { calls } = await openEditor({ 'PATCH /api/studies/study-1/themes/home': { status: 200, body: { ...home, version: 4 } } })
    await type('Plain-language description (for partners)', HARD)
    const hint = () => document.body.querySelector('.theme-readability-hint')!
    expect(hint().querySelector('.theme-readability-grade')!.textContent).toBe('Grade 11.2')
    expect(hint().textContent).toContain('aim for 8 or below')
    expect(hint().querySelector('.theme-readability-warning')).not.toBeNull()
    await type('Plain-language description (for partners)', EASY)
    expect(hint().querySelector('.theme-readability-grade')!.textContent).toBe('Grade -2.6')
    expect(hint().querySelector('.theme-readability-warning')).toBeNull()

    clickButton('Save theme')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PATCH')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PATCH')!.body!)).toEqual({
      version: 3,
      name: 'Home is not the same',
      description: 'Participants describe the house as changed.',
      plainDescription: EASY,
      codeIds: ['stairs'],
      excerpts: [
        { excerptId: 'ex-p03', shareWithPartners: false },
        { excerptId: 'ex-p07', shareWithPartners: false },
      ],
      status: 'draft',
    })
  })

  it('does not let an excerpt be shared when its participant did not allow quotes, and says why', async () => {
    const { calls } = await openEditor({ 'PATCH /api/studies/study-1/themes/home': { status: 200, body: home } })
    expect(shareSwitch('ex-p03').disabled).toBe(true)
    expect(row('ex-p03').textContent).toContain('Cannot be shared: this participant did not allow direct quotes, or has withdrawn their data.')
    expect(shareSwitch('ex-p07').disabled).toBe(false)
    expect(row('ex-p07').textContent).not.toContain('Cannot be shared')
    // Not chosen yet: nothing to share until it is used as support.
    expect(useBox('ex-p11').checked).toBe(false)
    expect(shareSwitch('ex-p11').disabled).toBe(true)

    shareSwitch('ex-p07').click()
    await flushPromises()
    useBox('ex-p11').click()
    await flushPromises()
    clickButton('Save theme')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PATCH')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PATCH')!.body!).excerpts).toEqual([
      { excerptId: 'ex-p03', shareWithPartners: false },
      { excerptId: 'ex-p07', shareWithPartners: true },
      { excerptId: 'ex-p11', shareWithPartners: false },
    ])
  })

  it('shows the server’s reason when the theme changed meanwhile, keeps what was typed and reloads', async () => {
    const detail = 'Someone saved this theme after you opened it.'
    const { calls } = await openEditor({
      'PATCH /api/studies/study-1/themes/home': { status: 409, body: { type: 'stale', title: 'Changed meanwhile', status: 409, detail } },
    })
    const loadsBefore = calls.filter((c) => c.method === 'GET' && c.url === '/api/studies/study-1/themes').length
    await type('Name', 'Home changed')
    clickButton('Save theme')
    await vi.waitFor(() => expect(document.body.textContent).toContain(detail))
    expect(field('Name').value).toBe('Home changed')
    await vi.waitFor(() => expect(calls.filter((c) => c.method === 'GET' && c.url === '/api/studies/study-1/themes').length).toBeGreaterThan(loadsBefore))
  })
})
