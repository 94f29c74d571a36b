import { afterEach, describe, expect, it, vi } from 'vitest'
import PublicWithdrawalView from '@/views/public/PublicWithdrawalView.vue'
import { flushPromises, mountView, stubFetch } from './support'

const page = { studyTitle: 'Coming Home After Stroke', deadlineText: 'You can ask for your data to be removed up to 30 days after your interview.', alreadyRequested: false }

async function openPage() {
  const stub = stubFetch({
    'GET /api/public/withdrawal/w-1': { status: 200, body: page },
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-token' } },
    'POST /api/public/withdrawal/w-1': { status: 202, body: { detail: 'The study team will confirm by e-mail.' } },
  })
  const { wrapper } = await mountView(PublicWithdrawalView, { path: '/withdraw/w-1' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.text()).toContain('Coming Home After Stroke')
  })
  return { wrapper, ...stub }
}

describe('the public withdrawal page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('says taking part is voluntary, gives the deadline rule and offers two choices with nothing chosen', async () => {
    const { wrapper } = await openPage()
    expect(wrapper.text()).toContain('You can stop at any time')
    expect(wrapper.text()).toContain(page.deadlineText)
    const radios = wrapper.findAll('input[type="radio"]')
    expect(radios.map((r) => r.attributes('value'))).toEqual(['stop_keep_data', 'withdraw_data'])
    expect(radios.every((r) => !(r.element as HTMLInputElement).checked)).toBe(true)
  })

  it('sends the choice and the optional reason, then confirms kindly', async () => {
    const { wrapper, calls } = await openPage()
    await wrapper.find('form').trigger('submit')
    for (let i = 0; i < 5; i += 1) await flushPromises()
    expect(calls.filter((c) => c.method === 'POST')).toHaveLength(0)

    await wrapper.find('input[type="radio"][value="withdraw_data"]').setValue(true)
    await wrapper.find('textarea').setValue('I need to focus on my family.')
    await wrapper.find('form').trigger('submit')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('Thank you for letting us know')
    })
    expect(wrapper.text()).toContain('confirm it by e-mail')
    const post = calls.find((c) => c.method === 'POST')!
    expect(JSON.parse(post.body!)).toEqual({ scope: 'withdraw_data', reason: 'I need to focus on my family.' })
  })
})
