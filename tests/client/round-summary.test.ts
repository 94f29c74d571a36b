import { afterEach, describe, expect, it, vi } from 'vitest'
import { VERDICT_WORDS, type Answer, type RoundDetail } from '@shared/schemas/themes'
import ReviewRoundView from '@/views/themes/ReviewRoundView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const answer = (over: Partial<Answer> & Pick<Answer, 'id' | 'themeId' | 'partnerId' | 'partnerName'>): Answer => ({
  verdict: 'rings_true',
  comment: '',
  sharedNote: null,
  submittedAt: '2026-05-02T10:00:00Z',
  response: '',
  respondedAt: null,
  ...over,
})

const round: RoundDetail = {
  id: 'round-1',
  title: 'Spring round',
  closesOn: '2099-05-31',
  status: 'open',
  themeCount: 2,
  partners: 3,
  partnersDone: 1,
  createdAt: '2026-04-20T10:00:00Z',
  showCharacteristics: [],
  message: 'Thank you for reading these.',
  themes: [
    { id: 'home', name: 'Home is not the same', deleted: false },
    { id: 'leaflets', name: 'Too many leaflets', deleted: true },
  ],
  partnerList: [
    { id: 'pp-1', name: 'Partner Ash' },
    { id: 'pp-2', name: 'Partner Birch' },
    { id: 'pp-3', name: 'Partner Cedar' },
  ],
  answers: [
    answer({ id: 'a-1', themeId: 'home', partnerId: 'pp-1', partnerName: 'Partner Ash', comment: 'The stairs were the worst part for us too.' }),
    answer({ id: 'a-2', themeId: 'home', partnerId: 'pp-2', partnerName: 'Partner Birch', verdict: 'something_missing', comment: 'Nothing about the garden.', sharedNote: 'My husband missed his garden most.' }),
    answer({ id: 'a-3', themeId: 'leaflets', partnerId: 'pp-1', partnerName: 'Partner Ash', verdict: 'needs_discussion' }),
  ],
}
async function mountRound(extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
    'GET /api/studies/study-1/review-rounds/round-1': { status: 200, body: round },
    ...extra,
  })
  stubVisualViewport()
  const app = createTestApp()
  signInAs('lead')
  const { wrapper } = await mountView(ReviewRoundView, { app, path: '/studies/study-1/review-rounds/round-1' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[data-testid="round-answers"]').exists()).toBe(true)
  })
  return { wrapper, ...stub }
}

describe('the summary of a review round', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('lists each partner’s answer in words per theme, with counts, comments, shared notes and who is still to answer', async () => {
    const { wrapper } = await mountRound()
    const table = wrapper.find('[data-testid="round-answers"]')
    const home = table.find('tbody[data-theme-id="home"]')
    const rows = home.findAll('.round-answer-table-row')
    expect(rows).toHaveLength(2)
    expect(rows[0].text()).toContain('Partner Ash')
    expect(rows[0].text()).toContain(VERDICT_WORDS.rings_true)
    expect(rows[0].text()).toContain('The stairs were the worst part for us too.')
    expect(rows[1].text()).toContain('Partner Birch')
    expect(rows[1].text()).toContain(VERDICT_WORDS.something_missing)
    expect(rows[1].text()).toContain('Shared note: My husband missed his garden most.')
    expect(home.findAll('.round-answer-table-counts li').map((li) => li.text())).toEqual([
      `${VERDICT_WORDS.rings_true}: 1`,
      `${VERDICT_WORDS.needs_discussion}: 0`,
      `${VERDICT_WORDS.something_missing}: 1`,
    ])
    expect(home.text()).toContain('Not answered yet: Partner Cedar')
    const gone = table.find('tbody[data-theme-id="leaflets"]')
    expect(gone.text()).toContain('Too many leaflets (theme deleted since the round opened)')
    expect(gone.find('.round-answer-table-row').text()).toContain(VERDICT_WORDS.needs_discussion)
    // No comment, nothing to respond to.
    expect(gone.find('.round-response-field').exists()).toBe(false)
    expect(wrapper.text()).toContain('1 of 3 partners answered every theme')
  })

  it('sends what the team did with a comment', async () => {
    const responded = { ...round, answers: round.answers.map((a) => (a.id === 'a-2' ? { ...a, response: 'We added the garden to the theme.', respondedAt: '2026-05-05T10:00:00Z' } : a)) }
    const { wrapper, calls } = await mountRound({ 'PUT /api/studies/study-1/review-rounds/round-1/answers/a-2/response': { status: 200, body: responded } })
    const row = wrapper.find('.round-answer-table-row[data-answer-id="a-2"]')
    await row.find('textarea').setValue('We added the garden to the theme.')
    await row.find('form').trigger('submit')
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!)).toEqual({ response: 'We added the garden to the theme.' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('.round-answer-table-row[data-answer-id="a-2"]').text()).toContain('Saved; the partner can read it.')
    })
  })

  it('asks once before closing the round', async () => {
    const { calls } = await mountRound({ 'POST /api/studies/study-1/review-rounds/round-1/close': { status: 200, body: { ...round, status: 'closed' } } })
    const buttons = () => [...document.body.querySelectorAll<HTMLButtonElement>('button')].filter((b) => b.textContent?.trim() === 'Close the round')
    buttons()[0].click()
    await flushPromises()
    await vi.waitFor(() => expect(document.body.textContent).toContain('Close the round?'))
    expect(calls.some((c) => c.method === 'POST')).toBe(false)
    buttons().at(-1)!.click()
    await vi.waitFor(() => expect(calls.some((c) => c.url === '/api/studies/study-1/review-rounds/round-1/close' && c.method === 'POST')).toBe(true))
  })
})
