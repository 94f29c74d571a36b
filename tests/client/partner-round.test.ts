import { afterEach, describe, expect, it, vi } from 'vitest'
import type { DOMWrapper } from '@vue/test-utils'
import type { PartnerRound, PartnerTheme } from '@shared/schemas/themes'
import PartnerRoundView from '@/views/review/PartnerRoundView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, type FetchCall } from './support'

const emptyAnswer: PartnerTheme['answer'] = { verdict: null, comment: '', note: '', shareNote: false, submittedAt: null, response: '', respondedAt: null }

const theme = (over: Partial<PartnerTheme>): PartnerTheme => ({
  id: 'theme-1',
  name: 'Learning the stairs again',
  plainDescription: 'Families said the first days at home were hard because nobody showed them how to help with stairs.',
  quotes: [],
  answer: emptyAnswer,
  ...over,
})

const openRound: PartnerRound = {
  id: 'round-1',
  title: 'First look at the themes',
  closesOn: '2026-03-12',
  status: 'open',
  themeCount: 2,
  answered: 0,
  message: 'Thank you for helping us. Take your time.',
  themes: [
    theme({
      quotes: [
        {
          text: 'Nobody told us <script>alert(1)</script> what to do about the stairs.',
          pseudonym: 'P03',
          characteristics: [
            { label: 'Relationship to patient', value: 'adult child' },
            { label: 'Region', value: 'rural' },
          ],
        },
      ],
    }),
    theme({ id: 'theme-2', name: 'Waiting for the phone to ring', plainDescription: 'People waited a long time for calls from the clinic.' }),
  ],
}

const ROUND_URL = 'GET /api/studies/study-1/partner/rounds/round-1'
const PUT_URL = 'PUT /api/studies/study-1/partner/rounds/round-1/themes/theme-1'

async function openPage(round: PartnerRound, extra: Parameters<typeof stubFetch>[0] = {}) {
  const stub = stubFetch({ [ROUND_URL]: { status: 200, body: round }, 'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } }, ...extra })
  const app = createTestApp()
  signInAs('partner')
  const { wrapper } = await mountView(PartnerRoundView, { app, path: '/studies/study-1/review/round-1' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.findAll('[data-testid="partner-theme"]')).toHaveLength(round.themes.length)
  })
  return { wrapper, ...stub }
}

const cards = (wrapper: Awaited<ReturnType<typeof openPage>>['wrapper']) => wrapper.findAll('[data-testid="partner-theme"]')
const puts = (calls: FetchCall[]) => calls.filter((call) => call.method === 'PUT')
const textArea = (card: DOMWrapper<Element>, label: string) =>
  card.findAll('.v-textarea').find((field) => field.find('label').text() === label)!.find('textarea')
const button = (card: DOMWrapper<Element>, name: string) => card.findAll('button').find((b) => b.text() === name)!
const choose = (card: DOMWrapper<Element>, words: string) =>
  card.findAll('.v-radio').find((radio) => radio.text() === words)!.find('input').setValue(true)

async function settle() {
  for (let i = 0; i < 5; i += 1) await flushPromises()
}

describe('the patient partner’s round', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows each quote as text, with the pseudonym and the characteristics under it', async () => {
    const { wrapper } = await openPage(openRound)
    const quote = cards(wrapper)[0].find('blockquote')
    expect(quote.element.textContent).toBe('“Nobody told us <script>alert(1)</script> what to do about the stairs.”')
    expect(quote.element.querySelector('script')).toBeNull()
    const caption = cards(wrapper)[0].find('figcaption').element
    expect(caption.textContent).toBe('— P03, Relationship to patient: adult child, Region: rural')
    const seen = caption.cloneNode(true) as HTMLElement
    seen.querySelectorAll('.d-sr-only').forEach((node) => node.remove())
    expect(seen.textContent).toBe('— P03, adult child, rural')
  })

  it('greets the partner with the team’s message, the closing date and their progress', async () => {
    const { wrapper } = await openPage(openRound)
    expect(wrapper.find('h1').text()).toBe('First look at the themes')
    expect(wrapper.text()).toContain('Thank you for helping us. Take your time.')
    expect(wrapper.text()).toMatch(/Please answer by .*(March 12, 2026|12 March 2026)/)
    expect(wrapper.text()).toContain('There are no wrong answers.')
    expect(wrapper.text()).toContain('You have answered 0 of 2 themes.')
    // Headings go in order: the round, then each theme, then the parts of a theme.
    expect(wrapper.findAll('h1, h2, h3').map((h) => h.element.tagName)).toEqual(['H1', 'H2', 'H2', 'H3', 'H3', 'H2', 'H3'])
    const group = cards(wrapper)[0].find('[role="radiogroup"]')
    const label = document.getElementById(group.attributes('aria-labelledby')!)
    expect(label?.textContent).toBe('What do you think of this theme?')
  })

  it('sends the chosen answer, the comment and the note, then says it was sent', async () => {
    const sent = theme({ answer: { ...emptyAnswer, verdict: 'something_missing', comment: 'Say more about nights.', note: 'Ask Mum', shareNote: true, submittedAt: '2026-03-05T10:00:00Z' } })
    const { wrapper, calls } = await openPage(openRound, { [PUT_URL]: { status: 200, body: sent } })
    const card = cards(wrapper)[0]
    await choose(card, 'Something is missing')
    await textArea(card, 'Tell us more (optional)').setValue('Say more about nights.')
    await textArea(card, 'Your own notes — only you can see these').setValue('Ask Mum')
    await card.findAll('.v-checkbox').find((box) => box.text().includes('Share my note with the research team'))!.find('input').setValue(true)
    await button(card, 'Send my answer').trigger('click')
    await settle()

    expect(puts(calls)).toHaveLength(1)
    expect(JSON.parse(puts(calls)[0].body!)).toEqual({ verdict: 'something_missing', comment: 'Say more about nights.', note: 'Ask Mum', shareNote: true, submit: true })
    expect(card.find('[role="status"]').text()).toContain('Sent')
    expect(card.text()).toContain('Sent on')
    expect(wrapper.text()).toContain('You have answered 1 of 2 themes.')
  })

  it('saves a draft with “Save for later”, even before an answer is chosen', async () => {
    const { wrapper, calls } = await openPage(openRound, { [PUT_URL]: { status: 200, body: theme({ answer: { ...emptyAnswer, comment: 'Half a thought' } }) } })
    const card = cards(wrapper)[0]
    await textArea(card, 'Tell us more (optional)').setValue('Half a thought')
    await button(card, 'Save for later').trigger('click')
    await settle()
    expect(JSON.parse(puts(calls)[0].body!)).toEqual({ verdict: null, comment: 'Half a thought', note: '', shareNote: false, submit: false })
    expect(card.find('[role="status"]').text()).toContain('Saved')
    expect(wrapper.text()).toContain('You have answered 0 of 2 themes.')
  })

  it('asks for one of the three answers, beside them, before sending', async () => {
    const { wrapper, calls } = await openPage(openRound)
    const card = cards(wrapper)[0]
    await button(card, 'Send my answer').trigger('click')
    await settle()
    expect(puts(calls)).toHaveLength(0)
    const group = card.find('.v-radio-group')
    expect(group.find('.v-messages').text()).toBe('Choose one of the three answers before sending.')
  })

  it('keeps every word typed when the round has closed, and says so plainly', async () => {
    const closedProblem = { type: 'conflict', title: 'Conflict', status: 409, detail: 'This review round has closed.' }
    const { wrapper, calls } = await openPage(openRound, { [PUT_URL]: { status: 409, body: closedProblem } })
    const card = cards(wrapper)[0]
    await choose(card, 'This needs talking through')
    await textArea(card, 'Tell us more (optional)').setValue('My dad needed help at night too.')
    await textArea(card, 'Your own notes — only you can see these').setValue('Remember the ramp.')
    await button(card, 'Send my answer').trigger('click')
    await settle()

    expect(puts(calls)).toHaveLength(1)
    const alert = card.find('.v-alert[role="alert"]')
    expect(alert.text()).toContain('This round has closed')
    expect(alert.text()).toContain('copy them into an e-mail to the research team')
    expect((textArea(card, 'Tell us more (optional)').element as HTMLTextAreaElement).value).toBe('My dad needed help at night too.')
    expect((textArea(card, 'Your own notes — only you can see these').element as HTMLTextAreaElement).value).toBe('Remember the ramp.')
    const chosen = card.findAll('.v-radio').find((radio) => radio.text() === 'This needs talking through')!.find('input')
    expect((chosen.element as HTMLInputElement).checked).toBe(true)
    expect(button(card, 'Send my answer').attributes('disabled')).toBeDefined()
    expect(button(cards(wrapper)[1], 'Send my answer').attributes('disabled')).toBeDefined()
  })

  it('shows a closed round read-only: what the partner said and what the team did with it', async () => {
    const closedRound: PartnerRound = {
      ...openRound,
      status: 'closed',
      answered: 1,
      themes: [
        theme({
          answer: {
            ...emptyAnswer,
            verdict: 'rings_true',
            comment: 'This was just like us.',
            submittedAt: '2026-03-04T09:00:00Z',
            response: 'We kept this theme and added your words about the stairs.',
            respondedAt: '2026-03-20T09:00:00Z',
          },
        }),
        theme({ id: 'theme-2', name: 'Waiting for the phone to ring', answer: { ...emptyAnswer, verdict: 'needs_discussion', comment: 'More on calls', submittedAt: '2026-03-04T09:00:00Z' } }),
      ],
    }
    const { wrapper } = await openPage(closedRound)
    expect(wrapper.findAll('textarea')).toHaveLength(0)
    expect(wrapper.findAll('input[type="radio"]')).toHaveLength(0)
    expect(wrapper.findAll('button').some((b) => b.text() === 'Send my answer')).toBe(false)
    const [first, second] = cards(wrapper)
    expect(first.text()).toContain('What you said')
    expect(first.text()).toContain('This rings true')
    expect(first.text()).toContain('This was just like us.')
    expect(first.text()).toContain('What the team did with it')
    expect(first.text()).toContain('We kept this theme and added your words about the stairs.')
    expect(second.text()).toContain('This needs talking through')
    expect(second.text()).toContain('The team has not replied yet.')
    expect(wrapper.text()).toContain('You answered 2 of 2 themes.')
  })
})
