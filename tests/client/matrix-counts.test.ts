import { afterEach, describe, expect, it, vi } from 'vitest'
import type { CoOccurrenceMatrix, CodeParticipantMatrix } from '@shared/schemas/coding'
import MatricesView from '@/views/coding/MatricesView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

// Contrast as WCAG 2.2 defines it (relative luminance of sRGB, ratio (L1 + 0.05) / (L2 + 0.05));
// success criterion 1.4.3 (AA) asks at least 4.5:1 for body text.
function luminance(rgb: string): number {
  const [r, g, b] = rgb.match(/\d+/g)!.map(Number).map((v) => {
    const c = v / 255
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4
  })
  return 0.2126 * r + 0.7152 * g + 0.0722 * b
}
const contrast = (a: string, b: string) => {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x)
  return (hi + 0.05) / (lo + 0.05)
}

const codes = [
  { id: 'home', label: 'Living at home', colour: '#009E73', parentId: null },
  { id: 'stairs', label: 'Stairs', colour: '#E69F00', parentId: 'home' },
  { id: 'info', label: 'Information at discharge', colour: '#0072B2', parentId: null },
]
const byParticipant: CodeParticipantMatrix = {
  codes,
  participants: [
    { id: 'p1', pseudonym: 'P01' },
    { id: 'p2', pseudonym: 'P02' },
  ],
  cells: [
    { codeId: 'home', participantId: 'p1', count: 8 },
    { codeId: 'home', participantId: 'p2', count: 2 },
    { codeId: 'stairs', participantId: 'p1', count: 4 },
  ],
  excluded: 3,
}
const together: CoOccurrenceMatrix = { codes, cells: [{ a: 'home', b: 'home', count: 10 }, { a: 'home', b: 'stairs', count: 4 }], excluded: 0 }

async function mountMatrices(matrix: CodeParticipantMatrix = byParticipant) {
  const stub = stubFetch({
    'GET /api/studies/study-1/matrices/code-participant': { status: 200, body: matrix },
    'GET /api/studies/study-1/matrices/co-occurrence': { status: 200, body: together },
    'GET /api/studies/study-1/members': { status: 200, body: { members: [] } },
  })
  const app = createTestApp()
  signInAs('coder')
  const { wrapper } = await mountView(MatricesView, { app, path: '/studies/study-1/matrices' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading the matrix"]').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

describe('the code matrices', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('prints every count in a table with row and column headers, codes in codebook order', async () => {
    const { wrapper } = await mountMatrices()
    const table = wrapper.find('table.matrix-table')
    expect(table.findAll('thead th[scope="col"]').map((th) => th.text())).toEqual(['Code', 'P01', 'P02'])
    expect(table.findAll('tbody th[scope="row"] .d-sr-only').map((th) => th.text())).toEqual(['Living at home', 'Living at home › Stairs', 'Information at discharge'])
    const counts = table.findAll('tbody tr').map((tr) => tr.findAll('td').map((td) => td.text()))
    expect(counts).toEqual([
      ['8', '2'],
      ['4', '0'],
      ['0', '0'],
    ])
    expect(wrapper.text()).toContain('Excerpts of participants whose data may not be used are not counted (3 left out).')
  })

  it('tints cells in proportion to their count, leaves zeros plain and keeps the number readable (WCAG 2.2 AA)', async () => {
    const { wrapper } = await mountMatrices()
    const cells = wrapper.findAll('tbody td').map((td) => td.element as HTMLElement)
    const [eight, two, four, zero] = cells
    expect(eight.style.background).toBe('rgb(15, 92, 92)')
    expect(zero.style.background).toBe('')
    expect(luminance(eight.style.background)).toBeLessThan(luminance(four.style.background))
    expect(luminance(four.style.background)).toBeLessThan(luminance(two.style.background))
    for (const cell of [eight, two, four]) expect(contrast(cell.style.background, cell.style.color)).toBeGreaterThanOrEqual(4.5)
  })

  it('offers the CSV with or without a byte-order mark', async () => {
    const { wrapper } = await mountMatrices()
    const link = () => wrapper.find('a[download]').attributes('href')
    expect(link()).toBe('/api/studies/study-1/matrices/code-participant.csv')
    await wrapper.find('input[type="checkbox"]').setValue(true)
    expect(link()).toBe('/api/studies/study-1/matrices/code-participant.csv?bom=1')
  })

  it('shows co-occurrence both ways round, with each code’s own count on the diagonal', async () => {
    const { wrapper } = await mountMatrices()
    await wrapper.findAll('.v-tab').find((tab) => tab.text() === 'Codes that occur together')!.trigger('click')
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('td.matrix-table-cell-diagonal').exists()).toBe(true)
    })
    const table = wrapper.find('table.matrix-table')
    const counts = table.findAll('tbody tr').map((tr) => tr.findAll('td').map((td) => td.text()))
    expect(counts).toEqual([
      ['10', '4', '0'],
      ['4', '0', '0'],
      ['0', '0', '0'],
    ])
    expect(table.find('tbody tr td.matrix-table-cell-diagonal').text()).toBe('10')
  })

  it('says so when nothing is coded yet', async () => {
    const { wrapper } = await mountMatrices({ ...byParticipant, cells: [], excluded: 0 })
    expect(wrapper.text()).toContain('Nothing is coded yet')
    expect(wrapper.find('table.matrix-table').exists()).toBe(false)
  })
})
