import { afterEach, describe, expect, it, vi } from 'vitest'
import type { ConsentForm, ConsentRecord, ParticipantConsentView } from '@shared/schemas/consent'
import type { ParticipantDetail } from '@shared/schemas/recruitment'
import ParticipantConsentCard from '@/components/consent/ParticipantConsentCard.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const MEANING = 'Consent to take part in the study as described in consent form version 2.0.'
const form: ConsentForm = {
  id: '11111111-1111-4111-8111-111111111111',
  label: '2.0',
  status: 'approved',
  ethicsApprovalDate: '2026-01-10',
  effectiveDate: '2026-01-15',
  clauses: [{ key: 'direct_quotes', wording: 'May we quote your words without your name?', requiredForParticipation: false }],
  text: 'You are invited to take part.',
  file: { name: 'consent-v2.pdf', contentType: 'application/pdf', size: 1000, sha256: 'a'.repeat(64) },
  documentSha256: 'b'.repeat(64),
  checklist: {},
  approvedAt: '2026-01-15T10:00:00.000Z',
  approvedBy: 'Lead Example',
  createdAt: '2026-01-14T10:00:00.000Z',
  consentCount: 1,
}
const record = (over: Partial<ConsentRecord>): ConsentRecord => ({
  id: 'r-1',
  participantId: 'p-1',
  formId: form.id,
  formLabel: '2.0',
  formStatus: 'approved',
  method: 'verbal',
  clauses: { direct_quotes: false },
  signerName: 'Robin Invented',
  signedAt: '2026-02-01T14:30:00.000Z',
  meaning: MEANING,
  obtainedBy: 'Casey Coordinator',
  witnessName: 'Alex Witness',
  documentSha256: 'b'.repeat(64),
  signedFileName: null,
  corrects: null,
  correctedBy: null,
  note: '',
  ...over,
})
const earlier = record({ id: 'r-0', signerName: 'Robin Inventd', signedAt: '2026-01-31T09:00:00.000Z', correctedBy: 'r-1' })
const current = record({ corrects: 'r-0' })
const view: ParticipantConsentView = { records: [earlier, current], current, links: [], withdrawal: null }
const participant = (email: string): ParticipantDetail => ({
  id: 'p-1',
  pseudonym: 'P01',
  status: 'consented',
  helpSeeking: false,
  source: 'phone',
  characteristics: {},
  lastActivityAt: '2026-02-01T14:30:00.000Z',
  contact: { name: 'Robin Invented', email, phone: '+1 555 0100', country: '', timeZone: '' },
  sourceDetail: '',
  override: null,
  screenings: [],
  timeline: [],
})

async function mountCard(email = 'robin@example.test') {
  stubFetch({
    'GET /api/studies/study-1/participants/p-1/consent': { status: 200, body: view },
    'GET /api/studies/study-1/consent-forms': { status: 200, body: { forms: [form] } },
    'GET /api/studies/study-1/recruitment-settings': { status: 404, body: { type: 'not-found', title: 'Not found', status: 404 } },
  })
  const app = createTestApp()
  signInAs('coordinator')
  const { wrapper } = await mountView(ParticipantConsentCard, { app, path: '/studies/study-1/participants/p-1', props: { studyId: 'study-1', participant: participant(email) } })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.text()).toContain('Robin Invented')
  })
  return wrapper
}

describe('the participant consent card', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('always shows the signer’s name, the time and the meaning of the signature together, in every record', async () => {
    const wrapper = await mountCard()
    // Open the earlier, corrected record too.
    await wrapper.find('.v-expansion-panel-title').trigger('click')
    await flushPromises()
    const blocks = wrapper.findAll('.participant-consent-record__signature')
    expect(blocks).toHaveLength(2)
    for (const [block, shown] of blocks.map((b, i) => [b, [current, earlier][i]] as const)) {
      expect(block.text()).toContain(shown.signerName)
      expect(block.text()).toContain(MEANING)
      expect(block.find('time').attributes('datetime')).toBe(shown.signedAt)
    }
  })

  it('shows each clause answer in words with the method, who obtained it and the witness', async () => {
    const wrapper = await mountCard()
    const text = wrapper.text()
    expect(text).toContain('May we quote your words without your name?')
    expect(text).toMatch(/May we quote your words without your name\?\s*No/)
    expect(text).toContain('Verbal, recorded by the team')
    expect(text).toContain('Casey Coordinator')
    expect(text).toContain('Alex Witness')
    expect(text).not.toContain('direct_quotes')
  })

  it('refuses to send an e-consent link without an e-mail address, and says why', async () => {
    const wrapper = await mountCard('')
    const send = wrapper.findAll('button').find((b) => b.text().includes('Send an e-consent link'))!
    expect(send.attributes('disabled')).toBeDefined()
    expect(wrapper.text()).toContain('Add an e-mail address to send a link.')
  })

  it('opens the verbal consent dialog on the approved version with no clause answered', async () => {
    stubVisualViewport()
    const wrapper = await mountCard()
    await wrapper.findAll('button').find((b) => b.text().includes('Record verbal consent'))!.trigger('click')
    await flushPromises()
    const dialog = document.querySelector('.v-dialog')!
    expect(dialog.textContent).toContain('Record verbal consent from P01')
    expect(dialog.textContent).toContain('Version 2.0')
    const radios = [...dialog.querySelectorAll<HTMLInputElement>('input[type="radio"]')]
    expect(radios).toHaveLength(2)
    expect(radios.some((radio) => radio.checked)).toBe(false)
  })
})
