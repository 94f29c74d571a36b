import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Interview } from '@shared/schemas/interviews'
import InterviewBookingDialog from '@/components/interviews/InterviewBookingDialog.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const interview: Interview = {
  id: '11111111-1111-4111-8111-111111111111',
  participantId: '22222222-2222-4222-8222-222222222222',
  pseudonym: 'P04',
  scheduledAt: '2027-03-27T17:00:00Z',
  participantTimeZone: 'America/Los_Angeles',
  interviewerTimeZone: 'Europe/London',
  participantLocal: '2027-03-27T10:00',
  interviewerLocal: '2027-03-27T17:00',
  interviewerId: '33333333-3333-4333-8333-333333333333',
  interviewerName: 'Casey Coordinator',
  mode: 'video',
  plannedMinutes: 60,
  actualMinutes: null,
  guideId: null,
  guideLabel: null,
  fieldNotes: '',
  status: 'scheduled',
  notesOnly: false,
  transcriptCount: 0,
}

async function openDialog() {
  const { calls } = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'token-1' } },
    'GET /api/studies/study-1/members': {
      status: 200,
      body: { members: [{ id: 'm-1', userId: interview.interviewerId, name: 'Casey Coordinator', email: 'c@heardwell.test', role: 'coordinator', joinedAt: '2026-01-01T00:00:00Z' }] },
    },
    'GET /api/studies/study-1/interview-guides': { status: 200, body: { guides: [] } },
    [`PATCH /api/studies/study-1/interviews/${interview.id}`]: { status: 200, body: { ...interview, scheduledAt: '2027-03-20T16:00:00Z' } },
  })
  stubVisualViewport()
  const app = createTestApp()
  signInAs('coordinator')
  const { wrapper } = await mountView(InterviewBookingDialog, { app, path: '/studies/study-1/interviews', props: { studyId: 'study-1', modelValue: false, interview } })
  // Opening resets the fields from the interview, as it does in the app.
  await wrapper.setProps({ modelValue: true })
  await flushPromises()
  const input = () => document.body.querySelector<HTMLInputElement>('input[type="datetime-local"]')
  await vi.waitFor(() => expect(input()).not.toBeNull())
  async function type(value: string) {
    const field = input()!
    field.value = value
    field.dispatchEvent(new Event('input', { bubbles: true }))
    await flushPromises()
  }
  const clocks = () => document.body.querySelector('.interview-booking-clocks__both')?.textContent?.replace(/\s+/g, ' ').trim() ?? ''
  return { wrapper, type, clocks, calls }
}

describe('the interview booking dialog', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows the time on the participant’s and the interviewer’s clocks as it is typed', async () => {
    const { type, clocks } = await openDialog()
    expect(clocks()).toBe('Participant: Sat 27 Mar 2027, 10:00 PDT · Interviewer: Sat 27 Mar 2027, 17:00 GMT')
    // The US clocks have gone forward on 14 March, the UK ones not until 28 March: seven hours apart.
    await type('2027-03-20T09:00')
    expect(clocks()).toBe('Participant: Sat 20 Mar 2027, 09:00 PDT · Interviewer: Sat 20 Mar 2027, 16:00 GMT')
  })

  it('says inline that a time skipped by the clocks going forward does not exist, and shows no clocks', async () => {
    const { type, clocks } = await openDialog()
    await type('2027-03-14T02:30')
    const messages = document.body.querySelector('.interview-booking-clocks .v-messages')?.textContent ?? ''
    expect(messages).toContain('2027-03-14 02:30 does not exist in America/Los_Angeles: the clocks go forward then.')
    expect(clocks()).not.toContain('Participant:')
  })

  async function submitWith(time: string) {
    const { type, calls } = await openDialog()
    await type(time)
    const submit = [...document.body.querySelectorAll('button')].find((b) => b.textContent?.includes('Move the interview'))!
    submit.click()
    await flushPromises()
    await new Promise((resolve) => setTimeout(resolve, 50))
    await flushPromises()
    return calls.filter((c) => c.method === 'PATCH')
  }

  it('does not send a time that does not exist', async () => {
    expect(await submitWith('2027-03-14T02:30')).toHaveLength(0)
  })

  it('sends an existing time as typed, with the zone it was typed in and both zones', async () => {
    const sent = await submitWith('2027-03-20T09:00')
    expect(sent).toHaveLength(1)
    expect(JSON.parse(sent[0].body ?? '{}')).toMatchObject({
      localTime: '2027-03-20T09:00',
      timeZoneOf: 'participant',
      participantTimeZone: 'America/Los_Angeles',
      interviewerTimeZone: 'Europe/London',
      interviewerId: interview.interviewerId,
    })
  })
})
