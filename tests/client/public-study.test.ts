import { afterEach, describe, expect, it, vi } from 'vitest'
import type { PublicStudy, Question } from '@shared/schemas/recruitment'
import PublicStudyView from '@/views/public/PublicStudyView.vue'
import { todayIso } from '@/composables/useScreeningAnswers'
import { flushPromises, mountView, stubFetch } from './support'

const base = { help: '', required: true, options: [], min: null, max: null, rule: null, exclusionReason: 'excluded', characteristic: null } as const
const question = (q: Partial<Question> & Pick<Question, 'id' | 'text' | 'kind'>): Question => ({ ...base, role: 'information', ...q }) as Question

const everyKind: Question[] = [
  question({ id: 'caregiver', text: 'Did you care for a relative after a stroke?', kind: 'yes_no', role: 'inclusion', rule: { operator: 'is', value: 'yes' } }),
  question({ id: 'region', text: 'Where do you live?', kind: 'single_choice', options: [{ value: 'north', label: 'North' }, { value: 'south', label: 'South' }] }),
  question({ id: 'support', text: 'Which help did you get?', kind: 'multiple_choice', required: false, options: [{ value: 'nurse', label: 'A nurse visited' }, { value: 'phone', label: 'A phone line' }] }),
  question({ id: 'age', text: 'How old are you?', kind: 'number', min: 18, max: 110 }),
  question({ id: 'discharge', text: 'When did your relative come home?', kind: 'date' }),
  question({ id: 'story', text: 'Anything else you want to tell us?', kind: 'free_text', required: false }),
]

const study = (questions: Question[]): PublicStudy => ({
  code: 'CHAS',
  title: 'Coming Home After Stroke',
  publicSummary: 'We want to hear what family carers wish they had known when their relative left hospital.',
  whoCanTakePart: 'Adults who cared for a family member after a stroke.',
  recruiting: true,
  questionnaire: { intro: '', version: 1, questions },
})

async function openPage(questions: Question[], extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({ 'GET /api/public/studies/CHAS': { status: 200, body: study(questions) }, ...extra })
  const { wrapper } = await mountView(PublicStudyView, { path: '/join/CHAS' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.text()).toContain('Coming Home After Stroke')
  })
  return { wrapper, ...stub }
}

describe('the public study page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('draws each kind of question with its own control, the caution and a hidden trap field', async () => {
    const { wrapper } = await openPage(everyKind)
    expect(wrapper.text()).toContain('This is a research study. It does not give medical advice or care.')
    expect(wrapper.findAll('input[type="radio"][value="yes"], input[type="radio"][value="no"]')).toHaveLength(2)
    expect(wrapper.findAll('input[type="radio"][value="north"], input[type="radio"][value="south"]')).toHaveLength(2)
    expect(wrapper.findAll('input[type="checkbox"][value="nurse"], input[type="checkbox"][value="phone"]')).toHaveLength(2)
    const age = wrapper.find('input[type="number"]')
    expect([age.attributes('min'), age.attributes('max')]).toEqual(['18', '110'])
    expect(wrapper.find('input[type="date"]').attributes('max')).toBe(todayIso())
    expect(wrapper.find('textarea').exists()).toBe(true)
    expect(wrapper.text()).toContain('Anything else you want to tell us? (you may skip this)')
    const trap = wrapper.find('input[name="website"]')
    expect(trap.attributes('tabindex')).toBe('-1')
    expect(trap.attributes('autocomplete')).toBe('off')
    expect(trap.element.closest('[aria-hidden="true"]')).not.toBeNull()
  })

  it('says the study cannot take people when it is not recruiting, and shows no form', async () => {
    stubFetch({ 'GET /api/public/studies/CHAS': { status: 200, body: { ...study(everyKind), recruiting: false } } })
    const { wrapper } = await mountView(PublicStudyView, { path: '/join/CHAS' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('not taking new people right now')
    })
    expect(wrapper.find('form').exists()).toBe(false)
  })

  it('answers a person looking for help with care and resources, never with an internal code', async () => {
    const { wrapper, calls } = await openPage([question({ id: 'caregiver', text: 'Did you care for a relative after a stroke?', kind: 'yes_no' })], {
      'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-token' } },
      'POST /api/public/studies/CHAS/enquiries': {
        status: 201,
        body: {
          outcome: 'help_seeking',
          studyTitle: 'Coming Home After Stroke',
          resources: [{ title: 'Stroke carers support line', text: 'Free advice, every day.', url: 'https://example.org/support' }],
        },
      },
    })
    await wrapper.find('input[type="radio"][value="no"]').setValue(true)
    await wrapper.find('input[autocomplete="name"]').setValue('Jo Invented')
    await wrapper.find('input[type="email"]').setValue('jo@example.test')
    const consent = wrapper.findAll('input[type="checkbox"]').find((box) => box.element.closest('.v-checkbox')?.textContent?.includes('You may contact me'))
    await consent!.setValue(true)
    await wrapper.find('form').trigger('submit')

    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.text()).toContain('Thank you')
      expect(wrapper.text()).toContain('Stroke carers support line')
    })
    const text = wrapper.text()
    expect(text).toContain('contact your own care provider')
    expect(text).toContain('emergency')
    expect(text).not.toMatch(/help_seeking|help-seeking|not_eligible|needs_review/)
    const sent = JSON.parse(calls.find((call) => call.method === 'POST')!.body!)
    expect(sent).toMatchObject({ answers: { caregiver: 'no' }, consentToContact: true, contact: { name: 'Jo Invented', email: 'jo@example.test' } })
  })

  it('puts the server’s field errors under the matching question and contact field', async () => {
    const { wrapper } = await openPage([question({ id: 'caregiver', text: 'Did you care for a relative after a stroke?', kind: 'yes_no' })], {
      'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-token' } },
      'POST /api/public/studies/CHAS/enquiries': {
        status: 400,
        body: {
          type: 'validation',
          title: 'Check the form',
          status: 400,
          errors: [
            { path: 'answers.caregiver', message: 'Choose yes or no here.' },
            { path: 'contact.email', message: 'This address cannot receive mail.' },
          ],
        },
      },
    })
    await wrapper.find('input[type="radio"][value="yes"]').setValue(true)
    await wrapper.find('input[autocomplete="name"]').setValue('Jo Invented')
    await wrapper.find('input[type="email"]').setValue('jo@example.test')
    const consent = wrapper.findAll('input[type="checkbox"]').find((box) => box.element.closest('.v-checkbox')?.textContent?.includes('You may contact me'))
    await consent!.setValue(true)
    await wrapper.find('form').trigger('submit')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('.screening-question').text()).toContain('Choose yes or no here.')
    })
    expect(wrapper.find('.participant-contact-fields').text()).toContain('This address cannot receive mail.')
  })
})
