import { afterEach, describe, expect, it, vi } from 'vitest'
import type { StudyRole } from '@shared/permissions'
import type { ChecklistItem, ChecklistReport } from '@shared/schemas/reports'
import ReportsChecklist from '@/components/reports/ReportsChecklist.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

// COREQ: Tong, Sainsbury & Craig (2007), Int J Qual Health Care 19(6):349–357 — 32 items in three
// domains of 8, 15 and 9 (labels are ours, after /work/shared/reference/check-values.md §5).
// Domain names from memory.
const labels = [
  'Who interviewed', 'Interviewer’s credentials', 'Interviewer’s occupation', 'Interviewer’s gender', 'Interviewer’s experience and training',
  'Prior relationship with participants', 'What participants knew about the researcher', 'Interviewer characteristics reported',
  'Methodological orientation', 'Sampling', 'How participants were approached', 'Number of participants', 'Non-participation and reasons',
  'Setting of data collection', 'Others present', 'Sample description', 'Interview guide and pilot', 'Repeat interviews',
  'Audio or visual recording', 'Field notes', 'Duration', 'Saturation', 'Transcripts returned', 'Number of coders', 'Coding tree',
  'Where themes came from', 'Software', 'Participant checking', 'Quotations identified', 'Data and findings consistent',
  'Major themes clear', 'Minor themes and diverse cases',
]
const domainOf = (n: number) => (n <= 8 ? 'Research team and reflexivity' : n <= 23 ? 'Study design' : 'Analysis and findings')
const items: ChecklistItem[] = labels.map((label, index) => ({
  number: String(index + 1),
  label,
  domain: domainOf(index + 1),
  where: index < 12 ? `Methods, paragraph ${index + 1}` : '',
  note: '',
  done: index < 12,
}))
const coreq = (list: ChecklistItem[]): ChecklistReport => ({
  name: 'coreq',
  title: 'COREQ',
  source: 'Tong, Sainsbury & Craig (2007)',
  items: list,
  done: list.filter((item) => item.done).length,
  total: list.length,
})
const withItem = (number: string, change: Partial<ChecklistItem>) => coreq(items.map((item) => (item.number === number ? { ...item, ...change } : item)))

async function mountChecklist(role: StudyRole, put?: { status: number; body: unknown }) {
  const stub = stubFetch({
    'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
    'GET /api/studies/study-1/reports/checklists/coreq': { status: 200, body: coreq(items) },
    ...(put ? { 'PUT /api/studies/study-1/reports/checklists/coreq/items/13': put } : {}),
  })
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(ReportsChecklist, { app, props: { studyId: 'study-1', name: 'coreq', editable: role === 'lead' || role === 'coordinator' } })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('.reports-checklist-table').exists()).toBe(true)
  })
  return { wrapper, ...stub }
}
const row = (wrapper: Awaited<ReturnType<typeof mountChecklist>>['wrapper'], number: string) => wrapper.find(`tr[data-number="${number}"]`)

describe('a reporting checklist', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('groups the 32 COREQ items under their three domains and shows progress', async () => {
    const { wrapper } = await mountChecklist('lead')
    expect(wrapper.findAll('.reports-checklist-domain').map((tr) => tr.text())).toEqual(['Research team and reflexivity', 'Study design', 'Analysis and findings'])
    expect(wrapper.findAll('tbody').map((body) => body.findAll('.reports-checklist-item').length)).toEqual([8, 15, 9])
    expect(wrapper.find('[data-testid="progress-coreq"]').text()).toBe('12 of 32 done')
    // 12 / 32 = 37.5 %, shown by the bar rounded to 38.
    expect(wrapper.find('.v-progress-linear').attributes('aria-valuenow')).toBe('38')
  })

  it('saves an item when it is ticked done, and shows the new progress from the answer', async () => {
    const { wrapper, calls } = await mountChecklist('lead', { status: 200, body: withItem('13', { done: true }) })
    await row(wrapper, '13').find('input[type="checkbox"]').setValue(true)
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('[data-testid="progress-coreq"]').text()).toBe('13 of 32 done')
    })
    const put = calls.find((call) => call.method === 'PUT')!
    expect(put.url).toBe('/api/studies/study-1/reports/checklists/coreq/items/13')
    expect(JSON.parse(put.body!)).toEqual({ where: '', note: '', done: true })
  })

  it('saves where an item is addressed when the field is left, and not when nothing changed', async () => {
    const { wrapper, calls } = await mountChecklist('lead', { status: 200, body: withItem('13', { where: 'Methods, data collection' }) })
    const field = row(wrapper, '13').find('input[type="text"]')
    await field.trigger('blur')
    await flushPromises()
    expect(calls.some((call) => call.method === 'PUT')).toBe(false)
    await field.setValue('Methods, data collection')
    await field.trigger('blur')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(calls.some((call) => call.method === 'PUT')).toBe(true)
    })
    const put = calls.find((call) => call.method === 'PUT')!
    expect(JSON.parse(put.body!)).toEqual({ where: 'Methods, data collection', note: '', done: false })
  })

  it('says which item was not saved and why, keeping what was typed', async () => {
    const problem = { type: 'validation', title: 'Check the highlighted fields', status: 400, detail: 'Where it is addressed is too long.' }
    const { wrapper } = await mountChecklist('coordinator', { status: 400, body: problem })
    const field = row(wrapper, '13').find('input[type="text"]')
    await field.setValue('Results')
    await field.trigger('blur')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(row(wrapper, '13').find('[role="alert"]').text()).toBe('Item 13 was not saved: Where it is addressed is too long.')
    })
    expect((row(wrapper, '13').find('input[type="text"]').element as HTMLInputElement).value).toBe('Results')
  })

  it('is read-only for coders', async () => {
    const { wrapper } = await mountChecklist('coder')
    expect(wrapper.find('input[type="text"]').exists()).toBe(false)
    expect(wrapper.find('textarea').exists()).toBe(false)
    expect(row(wrapper, '1').text()).toContain('Methods, paragraph 1')
    expect((row(wrapper, '1').find('input[type="checkbox"]').element as HTMLInputElement).disabled).toBe(true)
    expect(wrapper.text()).toContain('Only the study lead and coordinators can fill in the checklists.')
  })
})
