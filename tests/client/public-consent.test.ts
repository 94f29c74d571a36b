import { afterEach, describe, expect, it, vi } from 'vitest'
import type { PublicConsentPage } from '@shared/schemas/consent'
import PublicConsentView from '@/views/public/PublicConsentView.vue'
import { flushPromises, mountView, stubFetch, type FetchCall } from './support'

const page: PublicConsentPage = {
  studyTitle: 'Coming Home After Stroke',
  formLabel: '2.0',
  text: 'You are invited to take part in a research study.\nWe will talk with you for about an hour.',
  fileName: 'consent-v2.pdf',
  clauses: [
    { key: 'audio_recording', wording: 'May we record the sound of your interview?', requiredForParticipation: true },
    { key: 'direct_quotes', wording: 'May we quote your words without your name?', requiredForParticipation: false },
  ],
  today: '2026-03-02',
}
const signed = {
  signedAt: '2026-03-02T15:04:00.000Z',
  signerName: 'Jo Invented',
  meaning: 'I agree to take part in this study as the consent form describes.',
  formLabel: '2.0',
  studyTitle: 'Coming Home After Stroke',
}

async function openPage(extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({
    'GET /api/public/consent/tok-1': { status: 200, body: page },
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-token' } },
    'POST /api/public/consent/tok-1': { status: 201, body: signed },
    ...extra,
  })
  const { wrapper } = await mountView(PublicConsentView, { path: '/consent/tok-1' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.text()).toContain('Coming Home After Stroke')
  })
  return { wrapper, ...stub }
}

const posts = (calls: FetchCall[]) => calls.filter((call) => call.method === 'POST')

async function submit(wrapper: Awaited<ReturnType<typeof openPage>>['wrapper']) {
  await wrapper.find('form').trigger('submit')
  // Vuetify validates asynchronously; give it time to refuse or to send.
  for (let i = 0; i < 5; i += 1) await flushPromises()
}

function agreeBox(wrapper: Awaited<ReturnType<typeof openPage>>['wrapper']) {
  return wrapper.findAll('input[type="checkbox"]').find((box) => box.element.closest('.v-checkbox')?.textContent?.includes('I agree to take part'))!
}

describe('the public e-consent page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows the form, a yes and a no for every clause with nothing chosen, and the caution', async () => {
    const { wrapper } = await openPage()
    const radios = wrapper.findAll('input[type="radio"]')
    expect(radios).toHaveLength(4)
    expect(radios.every((radio) => !(radio.element as HTMLInputElement).checked)).toBe(true)
    expect(wrapper.text()).toContain('The study needs a yes to include you')
    expect(wrapper.text()).toContain('We will talk with you for about an hour.')
    expect(wrapper.find('a[download="consent-v2.pdf"]').attributes('href')).toBe('/api/public/consent/tok-1/file')
    expect(wrapper.text()).toContain('It does not give medical advice')
    expect((agreeBox(wrapper).element as HTMLInputElement).checked).toBe(false)
  })

  it('refuses to sign until every clause is answered and a name is typed', async () => {
    const { wrapper, calls } = await openPage()
    await agreeBox(wrapper).setValue(true)
    await submit(wrapper)
    expect(posts(calls)).toHaveLength(0)
    expect(wrapper.text()).toContain('Please choose yes or no.')

    const radios = wrapper.findAll('input[type="radio"]')
    await radios[0].setValue(true)
    await wrapper.find('input[autocomplete="name"]').setValue('Jo Invented')
    await submit(wrapper)
    expect(posts(calls)).toHaveLength(0)

    await wrapper.find('input[autocomplete="name"]').setValue('   ')
    await radios[3].setValue(true)
    await submit(wrapper)
    expect(posts(calls)).toHaveLength(0)
    expect(wrapper.text()).toContain('Please type your full name.')

    await wrapper.find('input[autocomplete="name"]').setValue('Jo Invented')
    await submit(wrapper)
    await vi.waitFor(async () => {
      await flushPromises()
      expect(posts(calls)).toHaveLength(1)
    })
    expect(JSON.parse(posts(calls)[0].body!)).toEqual({ clauses: { audio_recording: true, direct_quotes: false }, signerName: 'Jo Invented', agree: true })
  })

  it('confirms the signature with the name, the time and its meaning', async () => {
    const { wrapper } = await openPage()
    const radios = wrapper.findAll('input[type="radio"]')
    await radios[0].setValue(true)
    await radios[2].setValue(true)
    await wrapper.find('input[autocomplete="name"]').setValue('Jo Invented')
    await agreeBox(wrapper).setValue(true)
    await submit(wrapper)
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('You have signed')
    })
    const block = wrapper.find('.public-consent-done__signature').text()
    expect(block).toContain('Jo Invented')
    expect(block).toContain(signed.meaning)
    expect(wrapper.find('time').attributes('datetime')).toBe(signed.signedAt)
    expect(wrapper.text()).toContain('on its way to you by e-mail')
  })

  it('says how to ask for a new link when the link was used or has expired', async () => {
    stubFetch({
      'GET /api/public/consent/old': {
        status: 410,
        body: { type: 'https://heardwell.test/problems/link-expired', title: 'Gone', status: 410, detail: 'Ask the study team for a new link.' },
      },
    })
    const { wrapper } = await mountView(PublicConsentView, { path: '/consent/old' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('This link cannot be used any more')
    })
    expect(wrapper.text()).toContain('Ask the study team for a new link.')
    expect(wrapper.text()).toContain('contact the study team')
    expect(wrapper.find('form').exists()).toBe(false)
  })
})
