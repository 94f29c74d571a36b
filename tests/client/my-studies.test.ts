import { afterEach, describe, expect, it, vi } from 'vitest'
import MyStudiesView from '@/views/studies/MyStudiesView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const study = {
  id: 'study-1',
  code: 'CHAS',
  title: 'Coming Home After Stroke',
  summary: 'What family caregivers wish they had known at hospital discharge.',
  ethicsBoard: 'Invented University Research Ethics Board',
  ethicsReference: 'REB-0000-01',
  approvalDate: '2026-01-15',
  approvalExpiry: '2099-01-14',
  targetSampleSize: 12,
  leadName: 'Alex Invented',
  memberCount: 5,
  createdAt: '2026-01-10T09:00:00.000Z',
  myRole: 'coder',
}

describe('my studies', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('says what to do next when the person is on no study', async () => {
    stubFetch({ 'GET /api/studies': { status: 200, body: { studies: [] } } })
    const app = createTestApp()
    signInAs(null)
    const { wrapper } = await mountView(MyStudiesView, { app })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('You are not on a study yet')
    })
    expect(wrapper.text()).toContain('When a lead researcher invites you')
    expect(wrapper.find('.study-list-card').exists()).toBe(false)
  })

  it('shows one card per study with its code and the person’s role', async () => {
    stubFetch({ 'GET /api/studies': { status: 200, body: { studies: [study] } } })
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(MyStudiesView, { app })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.findAll('.study-list-card')).toHaveLength(1)
    })
    const card = wrapper.find('.study-list-card')
    expect(card.text()).toContain('Coming Home After Stroke')
    expect(card.text()).toContain('CHAS')
    expect(card.text()).toContain('Coder')
  })

  it('offers a retry with a readable message when Heardwell cannot be reached', async () => {
    stubFetch({ 'GET /api/studies': new TypeError('Failed to fetch') })
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(MyStudiesView, { app })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('Heardwell cannot be reached. Check your connection and try again.')
    })
    expect(wrapper.find('button').text()).toContain('Try again')
  })
})
