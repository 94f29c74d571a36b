import { describe, expect, it } from 'vitest'
import { CHECKLIST_INFO, COREQ_ITEMS, SRQR_ITEMS, checklistReport, isChecklistItem } from '../../shared/reports/checklists.js'
import { checklistReport as checklistReportSchema } from '../../shared/schemas/reports.js'

const domainSizes = (items: readonly { domain: string }[]) => {
  const sizes = new Map<string, number>()
  for (const i of items) sizes.set(i.domain, (sizes.get(i.domain) ?? 0) + 1)
  return Object.fromEntries(sizes)
}

describe('COREQ items (Tong, Sainsbury & Craig 2007: 32 items in 3 domains of 8, 15 and 9)', () => {
  it('has 32 items numbered 1 to 32', () => {
    expect(COREQ_ITEMS).toHaveLength(32)
    expect(COREQ_ITEMS.map((i) => i.number)).toEqual(Array.from({ length: 32 }, (_, k) => String(k + 1)))
  })
  it('groups them in domains of 8, 15 and 9, in that order', () => {
    expect(domainSizes(COREQ_ITEMS)).toEqual({ 'Research team and reflexivity': 8, 'Study design': 15, 'Analysis and findings': 9 })
    expect(COREQ_ITEMS[7]!.domain).toBe('Research team and reflexivity')
    expect(COREQ_ITEMS[8]!.domain).toBe('Study design')
    expect(COREQ_ITEMS[22]!.domain).toBe('Study design')
    expect(COREQ_ITEMS[23]!.domain).toBe('Analysis and findings')
  })
  it('puts items at their published numbers (Tong et al. 2007, table 1)', () => {
    const label = (n: string) => COREQ_ITEMS.find((i) => i.number === n)!.label
    expect(label('1')).toBe('Who interviewed')
    expect(label('12')).toBe('Number of participants')
    expect(label('22')).toBe('Saturation')
    expect(label('24')).toBe('Number of coders')
    expect(label('32')).toBe('Minor themes and diverse cases')
  })
})

describe("SRQR items (O'Brien et al. 2014: 21 items)", () => {
  it('has 21 items numbered S1 to S21', () => {
    expect(SRQR_ITEMS).toHaveLength(21)
    expect(SRQR_ITEMS.map((i) => i.number)).toEqual(Array.from({ length: 21 }, (_, k) => `S${k + 1}`))
  })
  it('groups them by the sections of a paper', () => {
    expect(domainSizes(SRQR_ITEMS)).toEqual({ 'Title and abstract': 2, Introduction: 2, Methods: 11, 'Results/findings': 2, Discussion: 2, Other: 2 })
    const item = (n: string) => SRQR_ITEMS.find((i) => i.number === n)!
    expect(item('S4')).toEqual({ number: 'S4', label: 'Purpose or question', domain: 'Introduction' })
    expect(item('S15')).toEqual({ number: 'S15', label: 'Trustworthiness techniques', domain: 'Methods' })
    expect(item('S21')).toEqual({ number: 'S21', label: 'Funding', domain: 'Other' })
  })
})

describe('checklistReport', () => {
  it('merges saved answers into the item list and counts the done ones', () => {
    const r = checklistReportSchema.parse(
      checklistReport('coreq', [
        { number: '3', where: 'Methods, paragraph 2', note: '', done: true },
        { number: '17', where: 'Appendix 1', note: 'Pilot with two caregivers', done: false },
        { number: '24', where: 'Methods, analysis', note: '', done: true },
        { number: 'S1', where: 'not a COREQ item', note: '', done: true },
        { number: '99', where: 'unknown', note: '', done: true },
      ]),
    )
    expect(r.name).toBe('coreq')
    expect(r.title).toBe(CHECKLIST_INFO.coreq.title)
    expect(r.source).toBe('Tong, Sainsbury & Craig (2007), International Journal for Quality in Health Care 19(6):349–357')
    expect(r.total).toBe(32)
    expect(r.done).toBe(2) // items 3 and 24; S1 and 99 are not COREQ items
    expect(r.items[16]).toEqual({ number: '17', label: 'Interview guide and pilot', domain: 'Study design', where: 'Appendix 1', note: 'Pilot with two caregivers', done: false })
    expect(r.items[0]).toEqual({ number: '1', label: 'Who interviewed', domain: 'Research team and reflexivity', where: '', note: '', done: false })
  })

  it('starts with nothing done', () => {
    const r = checklistReport('srqr', [])
    expect(r).toMatchObject({ name: 'srqr', done: 0, total: 21, source: "O'Brien et al. (2014), Academic Medicine 89(9):1245–1251" })
    expect(r.items.every((i) => !i.done && i.where === '' && i.note === '')).toBe(true)
  })

  it('knows which numbers belong to which checklist', () => {
    expect(isChecklistItem('coreq', '32')).toBe(true)
    expect(isChecklistItem('coreq', '33')).toBe(false)
    expect(isChecklistItem('srqr', 'S21')).toBe(true)
    expect(isChecklistItem('srqr', '21')).toBe(false)
  })
})
