import { afterEach, describe, expect, it, vi } from 'vitest'
import type { SamplingCharacteristic } from '@shared/schemas/recruitment'
import type { RoundDetail, Theme } from '@shared/schemas/themes'
import RoundOpenDialog from '@/components/themes/RoundOpenDialog.vue'
import ReviewRoundsView from '@/views/themes/ReviewRoundsView.vue'
import { useNotificationsStore } from '@/stores/notifications'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const theme = (id: string, name: string, parentId: string | null = null): Theme => ({
  id,
  parentId,
  position: 0,
  name,
  description: '',
  plainDescription: '',
  plainGrade: null,
  status: 'draft',
  codeIds: [],
  excerpts: [],
  support: { participants: 0, excerpts: 0 },
  inOpenRound: false,
  version: 1,
  updatedAt: '2026-04-10T10:00:00Z',
})
const themes = [theme('home', 'Home is not the same'), theme('stairs', 'The stairs as a daily test', 'home'), theme('help', 'Finding help')]
const characteristics: SamplingCharacteristic[] = [
  { key: 'age_band', label: 'Age band', values: [{ value: 'under_65', label: 'Under 65' }] },
  { key: 'lives_alone', label: 'Lives alone', values: [{ value: 'yes', label: 'Yes' }] },
]
const opened: RoundDetail = {
  id: 'round-1',
  title: 'Spring round',
  closesOn: '2099-05-31',
  status: 'open',
  themeCount: 2,
  partners: 2,
  partnersDone: 0,
  createdAt: '2026-04-20T10:00:00Z',
  showCharacteristics: ['lives_alone'],
  message: '',
  themes: [],
  partnerList: [
    { id: 'pp-1', name: 'Partner One' },
    { id: 'pp-2', name: 'Partner Two' },
  ],
  answers: [],
}
async function openDialog(reply: { status: number; body: unknown }) {
  const stub = stubFetch({ 'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } }, 'POST /api/studies/study-1/review-rounds': reply })
  stubVisualViewport()
  const app = createTestApp()
  signInAs('lead')
  const { wrapper } = await mountView(RoundOpenDialog, { app, path: '/studies/study-1/review-rounds', props: { studyId: 'study-1', themes, characteristics, modelValue: false } })
  await wrapper.setProps({ modelValue: true })
  await flushPromises()
  await vi.waitFor(() => expect(document.body.textContent).toContain('Open a review round'))
  return { wrapper, ...stub }
}

function input(label: string): HTMLInputElement {
  const element = [...document.body.querySelectorAll('label')].find((l) => l.textContent?.trim() === label && l.htmlFor)!
  return document.getElementById(element.htmlFor) as HTMLInputElement
}
async function type(label: string, value: string): Promise<void> {
  const field = input(label)
  field.value = value
  field.dispatchEvent(new Event('input', { bubbles: true }))
  await flushPromises()
}
async function tick(label: string): Promise<void> {
  input(label).click()
  await flushPromises()
}
const submit = () => [...document.body.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.trim() === 'Open the round')!.click()

async function fillIn(): Promise<void> {
  await type('Title', 'Spring round')
  await tick('Home is not the same')
  await tick('Finding help')
  await type('Closing date', '2099-05-31')
  await tick('Lives alone')
  await type('Message to partners (optional)', 'Thank you for reading these.')
}

describe('opening a review round', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('posts the title, chosen themes, closing date, characteristics and message, and says the partners were e-mailed', async () => {
    const { calls } = await openDialog({ status: 201, body: opened })
    expect(input('Closing date').type).toBe('date')
    expect(input('Sub-theme: The stairs as a daily test')).not.toBeNull()
    await fillIn()
    submit()
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'POST')!.body!)).toEqual({
      title: 'Spring round',
      themeIds: ['home', 'help'],
      closesOn: '2099-05-31',
      showCharacteristics: ['lives_alone'],
      message: 'Thank you for reading these.',
    })
    await vi.waitFor(() => expect(useNotificationsStore().queue.map((n) => n.text)).toContain('“Spring round” is open. All 2 partners were e-mailed.'))
  })

  it('asks for a theme before sending anything', async () => {
    const { calls } = await openDialog({ status: 201, body: opened })
    await type('Title', 'Spring round')
    await type('Closing date', '2099-05-31')
    submit()
    await vi.waitFor(() => expect(document.body.textContent).toContain('Choose at least one theme for the round.'))
    expect(calls.some((c) => c.method === 'POST')).toBe(false)
  })

  it('shows the server’s message under the closing date when it refuses the date (422)', async () => {
    const message = 'Choose a closing date after today.'
    await openDialog({ status: 422, body: { type: 'validation', title: 'Check the round', status: 422, errors: [{ path: 'closesOn', message }] } })
    await fillIn()
    submit()
    await vi.waitFor(() => expect(document.body.textContent).toContain(message))
    const dateField = input('Closing date').closest('.v-input')!
    expect(dateField.textContent).toContain(message)
  })

  it('shows a refusal without field details in the dialog (400)', async () => {
    const detail = 'The closing date must be after today.'
    await openDialog({ status: 400, body: { type: 'bad-request', title: 'Refused', status: 400, detail } })
    await fillIn()
    submit()
    await vi.waitFor(() => expect(document.body.querySelector('.v-dialog [role="alert"]')?.textContent).toContain(detail))
    // What was typed stays.
    expect(input('Title').value).toBe('Spring round')
  })
})

describe('the list of review rounds', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  async function mountList(rounds: unknown[]) {
    stubFetch({
      'GET /api/studies/study-1/review-rounds': { status: 200, body: { rounds } },
      'GET /api/studies/study-1/themes': { status: 200, body: { themes } },
      'GET /api/studies/study-1/recruitment-settings': { status: 404, body: { type: 'not-found', title: 'No settings yet', status: 404 } },
    })
    const app = createTestApp()
    signInAs('lead')
    const { wrapper } = await mountView(ReviewRoundsView, { app, path: '/studies/study-1/review-rounds' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('[aria-label="Loading the review rounds"]').exists()).toBe(false)
    })
    return wrapper
  }

  it('explains what a round is when there is none', async () => {
    const wrapper = await mountList([])
    expect(wrapper.text()).toContain('No review rounds yet')
    expect(wrapper.text()).toContain('patient partners read chosen themes in plain language')
    expect(wrapper.text()).toContain('say whether each rings true')
  })

  it('lists rounds with their status, themes and the partners who finished', async () => {
    const summary = { id: 'round-1', title: 'Spring round', closesOn: '2099-05-31', status: 'open', themeCount: 2, partners: 2, createdAt: '2026-04-20T10:00:00Z' }
    const wrapper = await mountList([{ ...summary, partnersDone: 1 }, { ...summary, id: 'round-0', title: 'Winter round', status: 'closed', partnersDone: 2 }])
    const rows = wrapper.findAll('tbody tr').map((tr) => tr.findAll('th, td').map((c) => c.text()))
    expect(rows.map((r) => [r[0], r[1], r[3], r[4]])).toEqual([
      ['Spring round', 'Open', '2', '1 of 2'],
      ['Winter round', 'Closed', '2', '2 of 2'],
    ])
    expect(rows[0][2]).toContain('2099')
    expect(wrapper.find('tbody a').attributes('href')).toBe('/studies/study-1/review-rounds/round-1')
  })
})
