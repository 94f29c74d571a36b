import { afterEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h } from 'vue'
import type { SaturationResponse } from '@shared/schemas/analysis'
import { assessSaturation, methodsSentence, type SaturationParams } from '@shared/analysis/saturation'
import SaturationView from '@/views/analysis/SaturationView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch } from './support'

// happy-dom has no 2D canvas for Chart.js to draw on: stand in for the chart and keep what it was given.
const drawn = vi.hoisted(() => ({ last: null as null | { type: string; data: { labels: string[]; datasets: { label: string; data: number[]; backgroundColor: string | string[]; yAxisID: string }[] } } }))
vi.mock('vue-chartjs', () => ({
  Chart: defineComponent({
    props: {
      type: { type: String, required: true },
      data: { type: Object, required: true },
      options: { type: Object, default: () => ({}) },
      plugins: { type: Array, default: () => [] },
      ariaLabel: { type: String, default: '' },
    },
    setup(props) {
      return () => {
        drawn.last = { type: props.type, data: props.data as never }
        return h('canvas', { role: 'img', 'aria-label': props.ariaLabel })
      }
    },
  }),
}))

const CITATION = 'Guest G, Namey E, Chen M (2020). A simple method to assess and report thematic saturation in qualitative research. PLOS ONE 15(5): e0232076.'

/**
 * The answer the server gives for interviews whose codes first appear as `newPerInterview`. The default
 * case reproduces the published ratios of Guest, Namey & Chen (2020): a base of 4 interviews with 37
 * codes, the first run adding 7 (19%), a later one 4 (11%), a final one 1 (below 5%).
 */
function answer(newPerInterview: number[], params: Partial<SaturationParams> = {}): SaturationResponse {
  let next = 0
  const codeSets = newPerInterview.map((n) => Array.from({ length: n }, () => `code-${next++}`))
  const result = assessSaturation(codeSets, params)
  return {
    params: result.params,
    interviews: newPerInterview.map((n, index) => ({
      transcriptId: `t-${index + 1}`,
      pseudonym: `P${String(index + 1).padStart(2, '0')}`,
      interviewDate: `2026-03-${String(index + 2).padStart(2, '0')}`,
      codes: n + 3,
      newCodes: result.newPerInterview[index],
      cumulative: result.cumulative[index],
    })),
    status: result.status,
    reached: result.reached,
    saturationAt: result.saturationAt,
    label: result.label,
    baseCodes: result.baseCodes,
    steps: result.steps,
    reason: result.reason,
    methodsSentence: methodsSentence(result),
    citation: CITATION,
  }
}
const published = [20, 9, 5, 3, 4, 3, 2, 2, 1, 0, 0, 0]

const members = [
  { id: 'm-1', userId: 'user-lead', name: 'Lead Researcher', email: 'lead@heardwell.test', role: 'lead', joinedAt: '2026-01-01T00:00:00Z' },
  { id: 'm-2', userId: 'user-coder-1', name: 'Coder One', email: 'coder1@heardwell.test', role: 'coder', joinedAt: '2026-01-01T00:00:00Z' },
  { id: 'm-3', userId: 'user-partner', name: 'Patient Partner', email: 'partner@heardwell.test', role: 'partner', joinedAt: '2026-01-01T00:00:00Z' },
]

async function mountSaturation(body: SaturationResponse | SaturationResponse[] = answer(published)) {
  const replies = (Array.isArray(body) ? body : [body]).map((b) => ({ status: 200, body: b }))
  const stub = stubFetch({
    'GET /api/studies/study-1/saturation': replies,
    'GET /api/studies/study-1/members': { status: 200, body: { members } },
  })
  const app = createTestApp()
  signInAs('coder')
  const { wrapper } = await mountView(SaturationView, { app, path: '/studies/study-1/saturation' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[aria-label="Loading the saturation assessment"]').exists()).toBe(false)
  })
  return { wrapper, ...stub }
}

const saturationCalls = (calls: { url: string }[]) => calls.filter((c) => c.url.startsWith('/api/studies/study-1/saturation')).map((c) => c.url)

describe('the saturation view', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    vi.useRealTimers()
    document.body.innerHTML = ''
  })

  it('states the result, explains X+Y and lists every run with its ratio', async () => {
    const { wrapper, calls } = await mountSaturation()
    expect(saturationCalls(calls)[0]).toBe('/api/studies/study-1/saturation?baseSize=4&runLength=2&threshold=0.05')
    // Guest, Namey & Chen (2020), with the fixture in the shared check values: saturation at "8+2".
    expect(wrapper.find('[data-testid="saturation-result"]').text()).toBe('Saturation reached at 8+2')
    const result = wrapper.find('.saturation-result').text()
    expect(result).toContain('8+2 means: after the first 8 interviews, the next 2 interviews together added new codes amounting to no more than 5% of the 37 codes')
    expect(result).toContain('Runs advance one interview at a time')
    const steps = wrapper.findAll('.saturation-result__steps li').map((li) => li.text())
    // published: the first run added 7 codes (19%), a later one 4 (11%), the saturating one 1 (below 5%)
    expect(steps[0]).toBe('Interviews 5–6: 7 new codes, 18.9% of the base — above the threshold')
    expect(steps[2]).toBe('Interviews 7–8: 4 new codes, 10.8% of the base — above the threshold')
    expect(steps[4]).toBe('Interviews 9–10: 1 new code, 2.7% of the base — meets the threshold')
  })

  it('shows the methods sentence read-only with its citation, and copies it', async () => {
    const writeText = vi.fn(async () => {})
    Object.defineProperty(navigator, 'clipboard', { value: { writeText }, configurable: true })
    const { wrapper } = await mountSaturation()
    const box = wrapper.find('.saturation-methods-text textarea')
    expect((box.element as HTMLTextAreaElement).value).toBe(answer(published).methodsSentence)
    expect(box.attributes('readonly')).toBeDefined()
    expect(wrapper.find('.saturation-methods-text').text()).toContain('PLOS ONE 15(5): e0232076')
    await wrapper.findAll('button').find((b) => b.text() === 'Copy')!.trigger('click')
    await flushPromises()
    expect(writeText).toHaveBeenCalledWith(answer(published).methodsSentence)
  })

  it('lists every interview in the data table with its counts', async () => {
    const { wrapper } = await mountSaturation()
    const rows = wrapper.findAll('[data-testid="saturation-table"] tbody tr')
    expect(rows).toHaveLength(12)
    const cells = (i: number) => rows[i].findAll('th, td').map((cell) => cell.text())
    expect(cells(0).filter((_, index) => index !== 2)).toEqual(['1 (base)', 'P01', '23', '20', '20'])
    expect(cells(0)[2]).toContain('2026')
    expect(cells(9).filter((_, index) => index !== 2)).toEqual(['10', 'P10', '3', '0', '49'])
    expect(wrapper.findAll('[data-testid="saturation-table"] thead th[scope="col"]').map((th) => th.text())).toEqual([
      'No.',
      'Participant',
      'Interview date',
      'Codes',
      'New codes',
      'Codes so far',
    ])
  })

  it('draws new codes as bars and codes so far as a line, marks the saturating run, and labels the canvas in words', async () => {
    const { wrapper } = await mountSaturation()
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('canvas').exists()).toBe(true)
    })
    expect(wrapper.find('canvas').attributes('aria-label')).toContain('saturation marked at 8+2')
    const [bars, line] = drawn.last!.data.datasets
    expect(drawn.last!.data.labels.slice(0, 2)).toEqual(['P01', 'P02'])
    expect(bars.data).toEqual(published)
    expect(line.data).toEqual([20, 29, 34, 37, 41, 44, 46, 48, 49, 49, 49, 49])
    expect(line.yAxisID).not.toBe(bars.yAxisID)
    // "8+2": the run of interviews 9 and 10 stands out from the rest
    const colours = bars.backgroundColor as string[]
    expect(colours.filter((colour) => colour !== colours[0])).toHaveLength(2)
    expect(colours[8]).not.toBe(colours[0])
    expect(colours[9]).not.toBe(colours[0])
  })

  it('asks again with the new parameters once typing stops, and goes back to the defaults on request', async () => {
    const { wrapper, calls } = await mountSaturation([answer(published), answer(published, { baseSize: 5, threshold: 0 }), answer(published)])
    const fields = wrapper.findAll('.saturation-params input')
    await fields[0].setValue('5')
    await fields[2].setValue('0')
    await vi.waitFor(
      async () => {
        await flushPromises()
        expect(saturationCalls(calls)).toContain('/api/studies/study-1/saturation?baseSize=5&runLength=2&threshold=0')
      },
      { timeout: 3000 },
    )
    // typing both fields within the pause asks once, not once per keystroke
    expect(saturationCalls(calls)).not.toContain('/api/studies/study-1/saturation?baseSize=5&runLength=2&threshold=0.05')
    await wrapper.findAll('button').find((b) => b.text() === 'Reset to the defaults')!.trigger('click')
    expect((fields[0].element as HTMLInputElement).value).toBe('4')
    expect((fields[2].element as HTMLInputElement).value).toBe('5')
  })

  it('does not ask while a parameter is out of range', async () => {
    const { wrapper, calls } = await mountSaturation()
    await wrapper.findAll('.saturation-params input')[1].setValue('0')
    await new Promise((resolve) => setTimeout(resolve, 600))
    await flushPromises()
    expect(saturationCalls(calls)).toHaveLength(1)
    expect(wrapper.text()).toContain('A whole number from 1 to 20.')
  })

  it('counts one coder’s codes when a coder is chosen, offering only leads and coders', async () => {
    const { wrapper, calls } = await mountSaturation()
    const select = wrapper.findComponent({ name: 'SaturationParams' }).findComponent({ name: 'VSelect' })
    expect((select.props('items') as { title: string }[]).map((item) => item.title)).toEqual(['All coders', 'Lead Researcher', 'Coder One'])
    select.vm.$emit('update:modelValue', 'user-coder-1')
    await vi.waitFor(
      async () => {
        await flushPromises()
        expect(saturationCalls(calls)).toContain('/api/studies/study-1/saturation?baseSize=4&runLength=2&threshold=0.05&coderId=user-coder-1')
      },
      { timeout: 3000 },
    )
  })

  it('explains why saturation cannot be assessed yet, in the server’s words', async () => {
    const few = answer([6, 4, 2])
    const { wrapper } = await mountSaturation(few)
    expect(wrapper.find('[data-testid="saturation-result"]').text()).toBe('Too few interviews to assess saturation yet')
    expect(wrapper.find('.saturation-result').text()).toContain(few.reason!)
  })

  it('says what to do when nothing is coded yet', async () => {
    const { wrapper } = await mountSaturation(answer([]))
    expect(wrapper.find('[role="status"]').text()).toContain('Nothing is coded yet')
    expect(wrapper.find('[data-testid="saturation-result"]').exists()).toBe(false)
    expect(wrapper.text()).toContain('Information power (Malterud, Siersma & Guassora 2016)')
  })
})
