import { afterEach, describe, expect, it, vi } from 'vitest'
import type { Code, SnapshotCode } from '@shared/schemas/coding'
import CodebookView from '@/views/coding/CodebookView.vue'
import CodebookMergeDialog from '@/components/coding/CodebookMergeDialog.vue'
import CodebookSnapshotDiff from '@/components/coding/CodebookSnapshotDiff.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const code = (over: Partial<Code> & Pick<Code, 'id' | 'label'>): Code => ({
  parentId: null,
  position: 0,
  definition: '',
  whenToUse: '',
  whenNotToUse: '',
  exampleExcerptId: null,
  example: null,
  colour: '#0072B2',
  status: 'active',
  mergedIntoId: null,
  version: 1,
  excerptCount: 0,
  updatedAt: '2026-04-03T10:00:00Z',
  ...over,
})

describe('changing the codebook', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('says what a merge will do before it is made, then sends the version and the target', async () => {
    const tired = code({ id: 'tired', label: 'Tiredness', excerptCount: 6, version: 2 })
    const fatigue = code({ id: 'fatigue', label: 'Fatigue', position: 1 })
    const { calls } = stubFetch({
      'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
      'POST /api/studies/study-1/codes/tired/merge': { status: 200, body: { codes: [{ ...tired, status: 'merged', mergedIntoId: 'fatigue' }, fatigue] } },
    })
    stubVisualViewport()
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(CodebookMergeDialog, { app, path: '/studies/study-1/codebook', props: { studyId: 'study-1', code: tired, codes: [tired, fatigue], modelValue: false } })
    await wrapper.setProps({ modelValue: true })
    await flushPromises()
    const select = wrapper.findComponent({ name: 'VAutocomplete' })
    select.vm.$emit('update:modelValue', 'fatigue')
    await flushPromises()
    expect(document.body.textContent).toContain('“Tiredness”: its 6 excerpts move to “Fatigue”; this code stays listed as merged and can no longer be applied.')
    ;[...document.body.querySelectorAll('button')].find((b) => b.textContent?.includes('Merge into “Fatigue”'))!.click()
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'POST')!.body!)).toEqual({ version: 2, intoId: 'fatigue' })
  })

  it('adds a code under another with the colour chosen from the named swatches', async () => {
    const home = code({ id: 'home', label: 'Living at home' })
    const { calls } = stubFetch({
      'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
      'GET /api/studies/study-1/codes': { status: 200, body: { codes: [home] } },
      'POST /api/studies/study-1/codes': { status: 201, body: code({ id: 'rails', label: 'Grab rails', parentId: 'home', colour: '#D55E00' }) },
    })
    stubVisualViewport()
    const app = createTestApp()
    signInAs('coder')
    const { wrapper } = await mountView(CodebookView, { app, path: '/studies/study-1/codebook' })
    await vi.waitFor(async () => {
      await flushPromises()
      expect(wrapper.find('button[aria-label="Add a code under “Living at home”"]').exists()).toBe(true)
    })
    await wrapper.find('button[aria-label="Add a code under “Living at home”"]').trigger('click')
    await flushPromises()
    await vi.waitFor(() => expect(document.body.textContent).toContain('New code under “Living at home”'))
    const label = [...document.body.querySelectorAll<HTMLInputElement>('input[type="text"]')].find((i) => i.maxLength === 80)!
    label.value = 'Grab rails'
    label.dispatchEvent(new Event('input', { bubbles: true }))
    const named = [...document.body.querySelectorAll<HTMLLabelElement>('label')].find((l) => l.textContent?.trim() === 'Vermilion')!
    expect(document.body.querySelectorAll('input[type="radio"]')).toHaveLength(8)
    document.getElementById(named.htmlFor)!.click()
    await flushPromises()
    ;[...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Add code' && b.getAttribute('type') === 'submit')!.click()
    await vi.waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true))
    expect(JSON.parse(calls.find((c) => c.method === 'POST')!.body!)).toEqual({
      label: 'Grab rails',
      definition: '',
      whenToUse: '',
      whenNotToUse: '',
      colour: '#D55E00',
      parentId: 'home',
    })
  })

  it('compares a snapshot with the codebook in a table of changes', async () => {
    const snap = (over: Partial<SnapshotCode> & Pick<SnapshotCode, 'id' | 'label'>): SnapshotCode => ({
      parentId: null,
      position: 0,
      definition: '',
      whenToUse: '',
      whenNotToUse: '',
      colour: '#0072B2',
      status: 'active',
      ...over,
    })
    const before = [snap({ id: 'a', label: 'Tiredness' }), snap({ id: 'b', label: 'Stairs', colour: '#E69F00' }), snap({ id: 'c', label: 'Leaflets' })]
    const after = [snap({ id: 'a', label: 'Fatigue' }), snap({ id: 'b', label: 'Stairs', colour: '#D55E00', parentId: 'a' }), snap({ id: 'd', label: 'Driving' })]
    const app = createTestApp()
    const { wrapper } = await mountView(CodebookSnapshotDiff, { app, props: { before, after, beforeName: 'First round', afterName: 'now' } })
    expect(wrapper.text()).toContain('1 added, 1 removed, 1 renamed, 1 moved, 1 changed, 0 unchanged.')
    const rows = wrapper.findAll('tbody tr').map((tr) => [tr.find('th').text(), ...tr.findAll('td').map((td) => td.text())])
    expect(rows).toEqual([
      ['Added', 'Driving', '—', 'added'],
      ['Removed', 'Leaflets', 'listed', '—'],
      ['Renamed', 'Fatigue', 'Tiredness', 'Fatigue'],
      ['Moved', 'Stairs', 'top level', 'under “Fatigue”'],
      ['Colour', 'Stairs', 'Orange', 'Vermilion'],
    ])
  })
})
