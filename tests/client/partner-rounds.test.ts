import { afterEach, describe, expect, it, vi } from 'vitest'
import PartnerRoundsView from '@/views/review/PartnerRoundsView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const round = (over: Record<string, unknown>) => ({ id: 'r', title: 'Round', closesOn: '2026-03-12', status: 'open', themeCount: 3, answered: 0, ...over })

async function openPage(rounds: unknown[]) {
  stubFetch({ 'GET /api/studies/study-1/partner/rounds': { status: 200, body: { rounds } } })
  const app = createTestApp()
  signInAs('partner')
  const { wrapper } = await mountView(PartnerRoundsView, { app, path: '/studies/study-1/review' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading your review rounds"]').exists()).toBe(false)
  })
  return wrapper
}

describe('the patient partner’s list of review rounds', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('says there is nothing to review yet and that the team will e-mail', async () => {
    const wrapper = await openPage([])
    expect(wrapper.text()).toContain('There is nothing to review yet. The research team will e-mail you when themes are ready for you.')
    expect(wrapper.findAll('a')).toHaveLength(0)
  })

  it('lists open rounds first, soonest to close on top, then the closed ones', async () => {
    const wrapper = await openPage([
      round({ id: 'old', title: 'Autumn round', closesOn: '2025-11-01', status: 'closed', answered: 3 }),
      round({ id: 'late', title: 'Second look', closesOn: '2026-04-30' }),
      round({ id: 'soon', title: 'First look', closesOn: '2026-03-12', answered: 1 }),
    ])
    expect(wrapper.findAll('h3').map((h) => h.text())).toEqual(['First look', 'Second look', 'Autumn round'])
    const [soon, , old] = wrapper.findAll('article')
    expect(soon.text()).toMatch(/Please answer by .*(March 12, 2026|12 March 2026)/)
    expect(soon.text()).toContain('You have answered 1 of 3 themes.')
    expect(soon.find('a').attributes('href')).toBe('/studies/study-1/review/soon')
    expect(soon.find('a').text()).toBe('Carry on answering: First look')
    expect(old.find('a').text()).toBe('See what the team did with your answers: Autumn round')
    expect(old.find('a').attributes('href')).toBe('/studies/study-1/review/old')
  })
})
