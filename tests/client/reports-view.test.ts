import { afterEach, describe, expect, it, vi } from 'vitest'
import type { StudyRole } from '@shared/permissions'
import type { CharacteristicsReport, ChecklistReport, FlowReport, MethodsSummary, QuotesReport } from '@shared/schemas/reports'
import ReportsView from '@/views/reports/ReportsView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

const cell = (count: number, percent: number) => ({ count, percent, suppressed: false })
const hidden = { count: null, percent: null, suppressed: true }

// Invented CHAS figures. Suppressing counts below 5 is common practice in statistical disclosure control.
const characteristics: CharacteristicsReport = {
  minCell: 5,
  roundingRule: 'Percentages are rounded to whole numbers, half away from zero.',
  suppressionRule: 'Counts from 1 to 4 are shown as <5, with no percentage.',
  totals: { interviewed: 16, consented: 18 },
  groups: [
    {
      key: 'relationship',
      label: 'Relationship to the stroke survivor',
      rows: [
        { value: 'spouse', label: 'Spouse or partner', interviewed: cell(9, 56), consented: cell(10, 56) },
        { value: 'child', label: 'Adult child', interviewed: cell(5, 31), consented: cell(6, 33) },
        { value: 'other', label: 'Other relative or friend', interviewed: hidden, consented: hidden },
        { value: '', label: 'Not reported', interviewed: hidden, consented: hidden },
      ],
    },
  ],
  duration: { n: 16, mean: 47.5, median: 45, min: 31, max: 72 },
  quoteLabelWarning: { characteristics: ['Relationship to the stroke survivor', 'Region'], groupsOfOne: 2 },
}

const flow: FlowReport = {
  stages: [
    { key: 'enquired', label: 'Enquired', count: 31 },
    { key: 'screened', label: 'Screened', count: 27 },
    { key: 'eligible', label: 'Eligible', count: 22 },
    { key: 'consented', label: 'Consented', count: 18 },
    { key: 'interviewed', label: 'Interviewed', count: 16 },
    { key: 'withdrawn', label: 'Withdrawn', count: 1 },
  ],
  exits: [
    { after: 'enquired', reason: 'Did not finish screening', count: 4 },
    { after: 'screened', reason: 'Did not meet the criteria', count: 5 },
    { after: 'eligible', reason: 'Declined to take part', count: 4 },
    { after: 'consented', reason: 'Could not be reached for an interview', count: 2 },
  ],
}

const quotes: QuotesReport = {
  themes: [
    {
      id: 'home',
      name: 'Home is not the same',
      status: 'agreed',
      quotes: [
        { text: 'The stairs were a <b>mountain</b> for weeks.', pseudonym: 'P03', characteristics: [{ label: 'Relationship', value: 'adult child' }] },
        { text: 'I slept downstairs until the rail went in.', pseudonym: 'P07', characteristics: [{ label: 'Relationship', value: 'spouse' }] },
      ],
    },
    { id: 'info', name: 'Left to find things out', status: 'draft', quotes: [] },
  ],
  leftOut: { declinedQuotation: 3, withdrawn: 2 },
  labelCharacteristics: ['Relationship'],
}

const checklist = (name: 'coreq' | 'srqr'): ChecklistReport => ({
  name,
  title: name === 'coreq' ? 'COREQ' : 'SRQR',
  source: 'Reporting guideline',
  items: [{ number: name === 'coreq' ? '1' : 'S1', label: 'Who interviewed', domain: 'Research team', where: '', note: '', done: false }],
  done: 0,
  total: 1,
})

const methods: MethodsSummary = {
  paragraphs: ['We interviewed 16 family carers of people who had a stroke.', 'Two coders coded every transcript.'],
  facts: {
    interviews: 16,
    modes: [{ mode: 'video', count: 10 }],
    duration: { n: 16, mean: 47.5, median: 45, min: 31, max: 72 },
    coders: 2,
    agreement: null,
    saturation: '8+2',
    reviewRounds: 1,
    partnerAnswers: 6,
  },
}

const emptyStudy = {
  characteristics: { ...characteristics, totals: { interviewed: 0, consented: 0 }, groups: [], duration: null, quoteLabelWarning: null } satisfies CharacteristicsReport,
  flow: { stages: flow.stages.map((stage) => ({ ...stage, count: 0 })), exits: [] } satisfies FlowReport,
  quotes: { themes: [], leftOut: { declinedQuotation: 0, withdrawn: 0 }, labelCharacteristics: [] } satisfies QuotesReport,
  methods: { paragraphs: [], facts: { ...methods.facts, interviews: 0, modes: [], duration: null, coders: 0, saturation: null, reviewRounds: 0, partnerAnswers: 0 } } satisfies MethodsSummary,
}

async function mountReports(options: { role?: StudyRole; empty?: boolean; characteristicsAfter?: CharacteristicsReport } = {}) {
  const data = options.empty ? emptyStudy : { characteristics, flow, quotes, methods }
  const stub = stubFetch({
    'GET /api/studies/study-1/reports/characteristics': [
      { status: 200, body: data.characteristics },
      { status: 200, body: options.characteristicsAfter ?? data.characteristics },
    ],
    'GET /api/studies/study-1/reports/recruitment-flow': { status: 200, body: data.flow },
    'GET /api/studies/study-1/reports/quotes-by-theme': { status: 200, body: data.quotes },
    'GET /api/studies/study-1/reports/checklists/coreq': { status: 200, body: checklist('coreq') },
    'GET /api/studies/study-1/reports/checklists/srqr': { status: 200, body: checklist('srqr') },
    'GET /api/studies/study-1/reports/methods-summary': { status: 200, body: data.methods },
  })
  const app = createTestApp()
  signInAs(options.role ?? 'lead')
  const { wrapper } = await mountView(ReportsView, { app, path: '/studies/study-1/reports' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('.v-skeleton-loader').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

describe('the reports page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('shows suppressed cells as "<5" with no percentage, and prints the rounding and suppression rules under the table', async () => {
    const { wrapper } = await mountReports()
    const table = wrapper.find('.reports-characteristics-table')
    expect(table.find('caption').text()).toBe('Relationship to the stroke survivor')
    expect(table.findAll('thead th').map((th) => th.text())).toEqual(['Value', 'Interviewed (n = 16)', 'Consented (n = 18)', 'n', '%', 'n', '%'])
    const rows = table.findAll('tbody tr').map((tr) => [tr.find('th').text(), ...tr.findAll('td').map((td) => td.text())])
    expect(rows).toEqual([
      ['Spouse or partner', '9', '56', '10', '56'],
      ['Adult child', '5', '31', '6', '33'],
      ['Other relative or friend', '<5', '—', '<5', '—'],
      ['Not reported', '<5', '—', '<5', '—'],
    ])
    const rules = wrapper.find('.reports-rules').text()
    expect(rules).toContain('Rounding: Percentages are rounded to whole numbers, half away from zero.')
    expect(rules).toContain('Suppression: Counts from 1 to 4 are shown as <5, with no percentage.')
    expect(rules).toContain('Interview duration (16 interviews): mean 47.5 minutes, median 45 minutes, range 31–72 minutes.')
  })

  it('asks the server again with the new threshold and labels suppressed cells with it', async () => {
    const { wrapper, calls } = await mountReports({ characteristicsAfter: { ...characteristics, minCell: 3 } })
    const asked = () => calls.filter((call) => call.url.includes('/reports/characteristics')).map((call) => call.url)
    expect(asked()).toEqual(['/api/studies/study-1/reports/characteristics?minCell=5'])
    const field = wrapper.find('[data-testid="min-cell"] input')
    await field.setValue('3')
    await field.trigger('change')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('.reports-characteristics-table tbody tr:nth-child(3) td').text()).toBe('<3')
    })
    expect(asked()).toEqual(['/api/studies/study-1/reports/characteristics?minCell=5', '/api/studies/study-1/reports/characteristics?minCell=3'])
    expect(wrapper.find('[data-testid="export-characteristics"]').attributes('href')).toBe('/api/studies/study-1/exports/characteristics.csv?minCell=3')
  })

  it('refuses a threshold outside 1 to 20 and keeps the last one', async () => {
    const { wrapper, calls } = await mountReports()
    const before = calls.length
    const field = wrapper.find('[data-testid="min-cell"] input')
    await field.setValue('0')
    await field.trigger('change')
    await flushPromises()
    expect(wrapper.text()).toContain('Choose a whole number from 1 to 20.')
    expect(calls.length).toBe(before)
    expect(wrapper.find('[data-testid="export-characteristics"]').attributes('href')).toContain('minCell=5')
  })

  it('warns when the characteristics that label quotes single out participants', async () => {
    const { wrapper } = await mountReports()
    const warning = wrapper.find('[data-testid="quote-label-warning"]')
    expect(warning.text()).toContain(
      'The characteristics used to label quotes (Relationship to the stroke survivor, Region) single out 2 participants: choose fewer or broader characteristics.',
    )
  })

  it('draws the recruitment flow and gives the same stages and exits in a table', async () => {
    const { wrapper } = await mountReports()
    const diagram = wrapper.find('[data-testid="flow-diagram"]')
    expect(diagram.attributes('aria-hidden')).toBe('true')
    expect(diagram.findAll('.reports-flow-diagram-stage').map((box) => box.text())).toEqual(['Enquired31', 'Screened27', 'Eligible22', 'Consented18', 'Interviewed16', 'Withdrawn1'])
    expect(diagram.findAll('.reports-flow-diagram-exit').map((box) => box.text())).toEqual([
      'Did not finish screening: 4',
      'Did not meet the criteria: 5',
      'Declined to take part: 4',
      'Could not be reached for an interview: 2',
    ])
    expect(diagram.findAll('.reports-flow-diagram-down')).toHaveLength(5)
    const rows = wrapper.findAll('[data-testid="flow-table"] tbody tr').map((tr) => [tr.find('th').text(), ...tr.findAll('td').map((td) => td.text())])
    expect(rows).toEqual([
      ['Enquired', '31', 'Did not finish screening: 4'],
      ['Screened', '27', 'Did not meet the criteria: 5'],
      ['Eligible', '22', 'Declined to take part: 4'],
      ['Consented', '18', 'Could not be reached for an interview: 2'],
      ['Interviewed', '16', 'None'],
      ['Withdrawn', '1', 'None'],
    ])
  })

  it('shows quotes as plain text with their labels, and says how many excerpts were left out and why', async () => {
    const { wrapper } = await mountReports()
    const quotes = wrapper.findAll('.reports-quotes-quote')
    expect(quotes[0].find('blockquote').text()).toBe('The stairs were a <b>mountain</b> for weeks.')
    expect(quotes[0].find('blockquote b').exists()).toBe(false)
    expect(quotes[0].find('figcaption').text()).toBe('— P03, adult child')
    expect(quotes[1].find('figcaption').text()).toBe('— P07, spouse')
    expect(wrapper.find('[data-testid="quotes-left-out"]').text()).toBe(
      '5 excerpts were left out: 3 because the participant did not agree to be quoted, 2 because the participant withdrew their data.',
    )
    expect(wrapper.text()).toContain('No quotes may be used for this theme.')
  })

  it('adds a byte-order mark to every download link when the switch is on', async () => {
    const { wrapper } = await mountReports()
    const links = () => Object.fromEntries(wrapper.findAll('[data-testid^="export-"]').map((link) => [link.attributes('data-testid'), link.attributes('href')]))
    expect(links()).toEqual({
      'export-audit': '/api/studies/study-1/exports/audit.csv',
      'export-characteristics': '/api/studies/study-1/exports/characteristics.csv?minCell=5',
      'export-recruitment-flow': '/api/studies/study-1/exports/recruitment-flow.csv',
      'export-quotes-by-theme': '/api/studies/study-1/exports/quotes-by-theme.csv',
      'export-codebook': '/api/studies/study-1/exports/codebook.csv',
      'export-coreq': '/api/studies/study-1/exports/coreq.csv',
      'export-srqr': '/api/studies/study-1/exports/srqr.csv',
    })
    await wrapper.find('[data-testid="bom-switch"] input').setValue(true)
    for (const [name, href] of Object.entries(links())) {
      expect(href, name).toMatch(/\.csv\?bom=1(&minCell=5)?$/)
    }
    expect(links()['export-characteristics']).toBe('/api/studies/study-1/exports/characteristics.csv?bom=1&minCell=5')
    expect(wrapper.findAll('a[download]').length).toBe(7)
  })

  it('offers the audit trail only to those who may read it', async () => {
    const { wrapper } = await mountReports({ role: 'coordinator' })
    expect(wrapper.find('[data-testid="export-audit"]').exists()).toBe(false)
    expect(wrapper.find('[data-testid="export-codebook"]').exists()).toBe(true)
  })

  it('shows the methods paragraphs in a read-only box and copies them', async () => {
    const { wrapper } = await mountReports()
    const writeText = vi.fn(async () => undefined)
    vi.stubGlobal('navigator', { ...navigator, clipboard: { writeText } })
    expect(wrapper.findAll('[data-testid="methods-text"] p').map((p) => p.text())).toEqual(methods.paragraphs)
    expect(wrapper.find('[data-testid="methods-text"] textarea').exists()).toBe(false)
    await wrapper.findAll('button').find((button) => button.text() === 'Copy the text')!.trigger('click')
    await flushPromises()
    expect(writeText).toHaveBeenCalledWith(methods.paragraphs.join('\n\n'))
  })

  it('explains an empty study in words, with no NaN anywhere', async () => {
    const { wrapper } = await mountReports({ empty: true })
    const text = wrapper.text()
    expect(text).not.toContain('NaN')
    expect(text).not.toContain('undefined')
    expect(text).toContain('No participants to describe yet')
    expect(text).toContain('No one has enquired yet')
    expect(text).toContain('No excerpts were left out.')
    expect(text).toContain('No themes yet')
    expect(text).toContain('There is nothing to summarise yet.')
    expect(wrapper.find('[data-testid="flow-diagram"]').exists()).toBe(false)
  })
})
