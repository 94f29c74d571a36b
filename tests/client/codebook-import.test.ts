import { afterEach, describe, expect, it, vi } from 'vitest'
import AppFileField from '@/components/app/AppFileField.vue'
import CodebookImportDialog from '@/components/coding/CodebookImportDialog.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const CSV = 'label,parent\r\nStair lift,Adaptations\r\nGrab rails,Feelings\r\n'

async function chooseFile(replies: Parameters<typeof stubFetch>[0]) {
  const stub = stubFetch({ 'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } }, ...replies })
  stubVisualViewport()
  const app = createTestApp()
  signInAs('coder')
  const { wrapper } = await mountView(CodebookImportDialog, { app, path: '/studies/study-1/codebook', props: { studyId: 'study-1', modelValue: false } })
  await wrapper.setProps({ modelValue: true })
  await flushPromises()
  wrapper.findComponent(AppFileField).vm.$emit('update:modelValue', new File([CSV], 'codebook.csv', { type: 'text/csv' }))
  await vi.waitFor(async () => {
    await flushPromises()
    expect(stub.calls.some((c) => c.method === 'POST')).toBe(true)
  })
  await flushPromises()
  return { wrapper, ...stub }
}

const importButton = () => [...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Import')!

describe('the codebook import', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('checks the file first with a dry run and lists each row’s mistake from a 422', async () => {
    const { calls } = await chooseFile({
      'POST /api/studies/study-1/codebook/import': {
        status: 422,
        body: {
          type: 'codebook-import',
          title: 'The file has mistakes',
          status: 422,
          detail: 'The file has 2 mistakes; nothing was imported.',
          errors: [
            { path: '1.parent', message: 'Row 1: the parent “Adaptations” is neither in this file nor in the codebook.' },
            { path: '2.parent', message: 'Row 2: the parent “Feelings” is neither in this file nor in the codebook.' },
          ],
        },
      },
    })
    expect(JSON.parse(calls.find((c) => c.method === 'POST')!.body!)).toEqual({ csv: CSV, dryRun: true })
    await vi.waitFor(() => {
      const items = [...document.body.querySelectorAll('.codebook-import-errors li')].map((li) => li.textContent)
      expect(items).toEqual([
        'Row 1: the parent “Adaptations” is neither in this file nor in the codebook.',
        'Row 2: the parent “Feelings” is neither in this file nor in the codebook.',
      ])
    })
    expect(document.body.textContent).toContain('The file has 2 mistakes; nothing was imported.')
    expect(importButton().disabled).toBe(true)
  })

  it('says what a clean file will do and imports it only when confirmed', async () => {
    const { calls } = await chooseFile({
      'POST /api/studies/study-1/codebook/import': [
        { status: 200, body: { created: 2, updated: 1, unchanged: 4, dryRun: true } },
        { status: 200, body: { created: 2, updated: 1, unchanged: 4, dryRun: false } },
      ],
    })
    await vi.waitFor(() => expect(document.body.textContent).toContain('This file adds 2 codes, changes 1 code and leaves 4 codes as they are.'))
    expect(calls.filter((c) => c.method === 'POST')).toHaveLength(1)
    importButton().click()
    await vi.waitFor(() => expect(calls.filter((c) => c.method === 'POST')).toHaveLength(2))
    expect(JSON.parse(calls.filter((c) => c.method === 'POST')[1].body!)).toEqual({ csv: CSV, dryRun: false })
  })
})
