import { afterEach, describe, expect, it, vi } from 'vitest'
import type { AgreementResponse, AnalysisSettings, Coefficient } from '@shared/schemas/analysis'
import type { StudyRole } from '@shared/permissions'
import { alphaBand, kappaBand } from '@shared/analysis/bands'
import AgreementView from '@/views/analysis/AgreementView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const kappa = (value: number): Coefficient => ({ value, band: kappaBand(value) })
const alpha = (value: number): Coefficient => ({ value, band: alphaBand(value) })
const unused: Coefficient = { value: null, reason: 'Not defined: nobody used this code' }

const coders = [
  { id: 'coder-1', name: 'Coder One' },
  { id: 'coder-2', name: 'Coder Two' },
]
const agreement: AgreementResponse = {
  enabled: true,
  unit: 'turn',
  coders,
  availableCoders: coders,
  transcripts: [
    { id: 't-5', pseudonym: 'P05', units: 40 },
    { id: 't-7', pseudonym: 'P07', units: 20 },
  ],
  units: 60,
  // the same table as "Taking over care" below
  overall: { percentAgreement: 0.7, kappa: kappa(0.4), alpha: alpha(0.4) },
  perCode: [
    {
      // values picked to reach the top bands (Landis & Koch 1977: 0.81–1.00; Krippendorff 2004: 0.800 and above)
      codeId: 'code-home',
      label: 'Living at home',
      colour: '#009E73',
      units: 60,
      codedBy: [
        { coderId: 'coder-1', units: 14 },
        { coderId: 'coder-2', units: 15 },
      ],
      percentAgreement: 0.95,
      kappa: kappa(0.88),
      alpha: alpha(0.881),
    },
    {
      // Krippendorff (2011), "Computing Krippendorff's Alpha-Reliability", binary example: two coders, ten units,
      // published alpha 0.095; percent agreement 0.600 and Cohen's kappa 0.090909 derived from the same table.
      codeId: 'code-discharge',
      label: 'Information at discharge',
      colour: '#0072B2',
      units: 10,
      codedBy: [
        { coderId: 'coder-1', units: 2 },
        { coderId: 'coder-2', units: 4 },
      ],
      percentAgreement: 0.6,
      kappa: kappa(0.090909),
      alpha: alpha(0.095238),
    },
    {
      codeId: 'code-stairs',
      label: 'Stairs',
      colour: '#E69F00',
      units: 60,
      codedBy: [
        { coderId: 'coder-1', units: 0 },
        { coderId: 'coder-2', units: 0 },
      ],
      percentAgreement: 1,
      kappa: unused,
      alpha: unused,
    },
    {
      // Cohen's kappa worked example of the encyclopaedia article "Cohen's kappa" (Wikipedia): [[20, 5], [10, 15]],
      // p_o 0.70, kappa 0.4. Alpha 0.400 for the same table computed by hand from Krippendorff (2011)'s
      // coincidence formula: 1 − 99·30 / (2·55·45).
      codeId: 'code-care',
      label: 'Taking over care',
      colour: '#D55E00',
      units: 50,
      codedBy: [
        { coderId: 'coder-1', units: 25 },
        { coderId: 'coder-2', units: 30 },
      ],
      percentAgreement: 0.7,
      kappa: kappa(0.4),
      alpha: alpha(0.4),
    },
  ],
  disagreements: [
    {
      transcriptId: 't-5',
      pseudonym: 'P05',
      start: 120,
      end: 168,
      text: '<b>Nobody told us</b> who to call at night.',
      codeId: 'code-discharge',
      codedBy: ['coder-1'],
      notCodedBy: ['coder-2'],
    },
    {
      transcriptId: 't-7',
      pseudonym: 'P07',
      start: 40,
      end: 90,
      text: 'I moved the bed downstairs.',
      codeId: 'code-home',
      codedBy: ['coder-2'],
      notCodedBy: ['coder-1'],
    },
  ],
  disagreementCount: 3,
  emptyReason: null,
}
const settings: AnalysisSettings = { agreementEnabled: true, agreementUnit: 'turn' }

async function mountAgreement(role: StudyRole, replies: { agreement?: { status: number; body: unknown }[] } = {}) {
  const stub = stubFetch({
    'GET /api/studies/study-1/agreement': replies.agreement ?? [{ status: 200, body: agreement }],
    'GET /api/studies/study-1/analysis-settings': { status: 200, body: settings },
    'PUT /api/studies/study-1/analysis-settings': { status: 200, body: { ...settings, agreementEnabled: false } },
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-token' } },
  })
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(AgreementView, { app, path: '/studies/study-1/agreement' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading agreement"]').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

const cellsOf = (row: { findAll: (s: string) => { text: () => string }[] }) => row.findAll('th, td').map((cell) => cell.text())

describe('the agreement view', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('lists one row per code, weakest alpha first, with each band and the sources of the bands', async () => {
    const { wrapper } = await mountAgreement('lead')
    const table = wrapper.find('[data-testid="agreement-table"]')
    const rows = table.findAll('tbody tr')
    expect(rows.map((row) => row.find('th[scope="row"]').text())).toEqual(['Information at discharge', 'Taking over care', 'Living at home', 'Stairs'])
    // Landis & Koch (1977): 0–0.20 slight, 0.21–0.40 fair, 0.81–1.00 almost perfect.
    // Krippendorff (2004) §11.4.4: below 0.667 do not rely on it; 0.800 and above reliable.
    expect(cellsOf(rows[0])).toEqual(['Information at discharge', '2 of 10', '4 of 10', '60.0%', '0.091 Slight', '0.095 Do not rely on it'])
    expect(cellsOf(rows[1])).toEqual(['Taking over care', '25 of 50', '30 of 50', '70.0%', '0.400 Fair', '0.400 Do not rely on it'])
    expect(cellsOf(rows[2])).toEqual(['Living at home', '14 of 60', '15 of 60', '95.0%', '0.880 Almost perfect', '0.881 Reliable'])
    expect(table.findAll('thead th[scope="col"]').map((th) => th.text())).toEqual([
      'Code',
      'Units coded by Coder One',
      'Units coded by Coder Two',
      'Percent agreement',
      'Cohen’s kappa 1',
      'Krippendorff’s alpha 2',
    ])
    const text = wrapper.text()
    expect(text).toContain('Landis & Koch (1977)')
    expect(text).toContain('Krippendorff (2004)')
    expect(text).toContain('0.667')
    expect(text).toContain('0.800')
    expect(text).toContain('60 speaker turns compared in 2 transcripts, coded by Coder One, Coder Two.')
  })

  it('sorts by kappa, and turns the order round on a second press', async () => {
    const { wrapper } = await mountAgreement('lead')
    const kappaButton = wrapper.findAll('[data-testid="agreement-table"] thead button').find((b) => b.text().startsWith('Cohen’s kappa'))!
    const order = () => wrapper.findAll('[data-testid="agreement-table"] tbody th[scope="row"]').map((th) => th.text())
    await kappaButton.trigger('click')
    expect(order()).toEqual(['Information at discharge', 'Taking over care', 'Living at home', 'Stairs'])
    expect(kappaButton.element.closest('th')!.getAttribute('aria-sort')).toBe('ascending')
    await kappaButton.trigger('click')
    // strongest first now; a code nobody used has no kappa and stays last either way
    expect(order()).toEqual(['Living at home', 'Taking over care', 'Information at discharge', 'Stairs'])
  })

  it('says in words why a coefficient is not defined, and never prints NaN', async () => {
    const { wrapper } = await mountAgreement('lead')
    const stairs = wrapper.findAll('[data-testid="agreement-table"] tbody tr').find((row) => row.find('th').text() === 'Stairs')!
    expect(cellsOf(stairs)).toEqual(['Stairs', '0 of 60', '0 of 60', '100.0%', 'Not defined: nobody used this code', 'Not defined: nobody used this code'])
    expect(document.body.textContent).not.toContain('NaN')
  })

  it('lists where coders differ with names, the passage as text and a link to that place in the coding view', async () => {
    const { wrapper } = await mountAgreement('lead')
    const list = wrapper.find('.agreement-disagreement-list')
    expect(list.text()).toContain('3 units where the coders differ on a code; showing the first 2.')
    const first = list.findAll('li')[0]
    expect(first.find('blockquote').text()).toBe('<b>Nobody told us</b> who to call at night.')
    expect(first.find('blockquote b').exists()).toBe(false)
    expect(first.text()).toContain('Coded by Coder One; not coded by Coder Two.')
    expect(first.find('a').attributes('href')).toBe('/studies/study-1/transcripts/t-5/coding?at=120')
    expect(first.find('a').text()).toContain('Open in the coding view')
  })

  it('filters the differences by code', async () => {
    const { wrapper } = await mountAgreement('lead')
    const list = wrapper.findComponent({ name: 'AgreementDisagreementList' })
    list.findComponent({ name: 'VSelect' }).vm.$emit('update:modelValue', 'code-home')
    await flushPromises()
    const items = list.findAll('li')
    expect(items).toHaveLength(1)
    expect(items[0].text()).toContain('P07')
  })

  it('lets the lead switch agreement off, sends the settings and asks for agreement again', async () => {
    const { wrapper, calls } = await mountAgreement('lead')
    const before = calls.filter((c) => c.method === 'GET' && c.url.startsWith('/api/studies/study-1/agreement')).length
    await wrapper.find('.agreement-settings-card input[type="checkbox"]').setValue(false)
    await vi.waitFor(async () => {
      await flushPromises()
      expect(calls.filter((c) => c.method === 'GET' && c.url.startsWith('/api/studies/study-1/agreement')).length).toBeGreaterThan(before)
    })
    const put = calls.find((c) => c.method === 'PUT')!
    expect(put.url).toBe('/api/studies/study-1/analysis-settings')
    expect(JSON.parse(put.body!)).toEqual({ agreementEnabled: false, agreementUnit: 'turn' })
    expect(wrapper.text()).toContain('Braun & Clarke (2021)')
  })

  it('sends the unit the lead chooses', async () => {
    const { wrapper, calls } = await mountAgreement('lead')
    await wrapper.find('.agreement-settings-card input[type="radio"][value="sentence"]').setValue(true)
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'PUT')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'PUT')!.body!)).toEqual({ agreementEnabled: true, agreementUnit: 'sentence' })
  })

  it('asks for the coders chosen, each as its own coderIds value', async () => {
    const third = { id: 'coder-3', name: 'Coder Three' }
    const { wrapper, calls } = await mountAgreement('lead', { agreement: [{ status: 200, body: { ...agreement, availableCoders: [...coders, third] } }] })
    wrapper.findComponent({ name: 'AgreementCoderPicker' }).findComponent({ name: 'VSelect' }).vm.$emit('update:modelValue', ['coder-1', 'coder-3'])
    await vi.waitFor(async () => {
      await flushPromises()
      expect(calls.some((c) => c.url === '/api/studies/study-1/agreement?coderIds=coder-1&coderIds=coder-3')).toBe(true)
    })
  })

  it('gives a coder no settings switch', async () => {
    const { wrapper, calls } = await mountAgreement('coder')
    expect(wrapper.find('.agreement-settings-card').exists()).toBe(false)
    expect(wrapper.text()).not.toContain('Check agreement between coders')
    expect(calls.some((c) => c.url.includes('analysis-settings'))).toBe(false)
    expect(wrapper.find('[data-testid="agreement-table"]').exists()).toBe(true)
  })

  it('explains to a coder that the lead has not allowed comparison when the server refuses', async () => {
    const refusal = { type: 'forbidden', title: 'Forbidden', status: 403, detail: 'Comparison between coders is off for this study.' }
    const { wrapper } = await mountAgreement('coder', { agreement: [{ status: 403, body: refusal }] })
    expect(wrapper.find('[role="status"]').text()).toContain('Your lead has not switched on comparison between coders, so agreement is shown to the lead only.')
    expect(wrapper.find('[role="alert"]').exists()).toBe(false)
  })

  it('explains that agreement is switched off, and tells the lead how to switch it on', async () => {
    const off: AgreementResponse = { ...agreement, enabled: false, overall: null, perCode: [], disagreements: [], disagreementCount: 0, emptyReason: 'Agreement is switched off for this study.' }
    const { wrapper } = await mountAgreement('lead', { agreement: [{ status: 200, body: off }] })
    expect(wrapper.text()).toContain('Agreement is switched off for this study')
    expect(wrapper.text()).toContain('Switch on “Check agreement between coders” above')
    expect(wrapper.find('[data-testid="agreement-table"]').exists()).toBe(false)
  })

  it('shows the server’s reason when there is nothing to compare', async () => {
    const reason = 'No transcript has been coded by two coders yet.'
    const empty: AgreementResponse = { ...agreement, overall: null, perCode: [], disagreements: [], disagreementCount: 0, emptyReason: reason }
    const { wrapper } = await mountAgreement('lead', { agreement: [{ status: 200, body: empty }] })
    expect(wrapper.find('[role="status"]').text()).toContain(reason)
    expect(wrapper.find('[data-testid="agreement-table"]').exists()).toBe(false)
  })
})
