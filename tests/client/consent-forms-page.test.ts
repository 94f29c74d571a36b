import { afterEach, describe, expect, it, vi } from 'vitest'
import type { ConsentForm } from '@shared/schemas/consent'
import AppConfirmDialog from '@/components/app/AppConfirmDialog.vue'
import ConsentFormsView from '@/views/consent/ConsentFormsView.vue'
import { createTestApp, flushPromises, mountView, signInAs, stubFetch, stubVisualViewport } from './support'

const version = (over: Partial<ConsentForm>): ConsentForm => ({
  id: 'f-1',
  label: '1.0',
  status: 'approved',
  ethicsApprovalDate: '2025-11-01',
  effectiveDate: '2025-11-10',
  clauses: [],
  text: 'We want to talk with you. It will take one hour.',
  file: { name: 'consent-v1.pdf', contentType: 'application/pdf', size: 1000, sha256: 'a'.repeat(64) },
  documentSha256: 'b'.repeat(64),
  checklist: { risks: true },
  approvedAt: '2025-11-10T10:00:00.000Z',
  approvedBy: 'Lead Example',
  createdAt: '2025-11-01T10:00:00.000Z',
  consentCount: 4,
  ...over,
})
const draft = version({ id: 'f-2', label: '2.0', status: 'draft', approvedAt: null, approvedBy: null, consentCount: 0, checklist: {} })

async function openPage(role: 'lead' | 'coordinator') {
  stubFetch({ 'GET /api/studies/study-1/consent-forms': { status: 200, body: { forms: [draft, version({})] } } })
  const app = createTestApp()
  signInAs(role)
  const { wrapper } = await mountView(ConsentFormsView, { app, path: '/studies/study-1/consent-forms' })
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.text()).toContain('Version 2.0')
  })
  return wrapper
}
const button = (wrapper: Awaited<ReturnType<typeof openPage>>, text: string) => wrapper.findAll('button').find((b) => b.text().includes(text))

describe('the consent forms page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('lets the lead approve a draft after one confirmation that names the version it replaces', async () => {
    const wrapper = await openPage('lead')
    expect(button(wrapper, 'Add a version')).toBeDefined()
      stubVisualViewport()
    const confirm = wrapper.findComponent(AppConfirmDialog)
    expect(confirm.props('modelValue')).toBe(false)
    await button(wrapper, 'Approve this version')!.trigger('click')
    await flushPromises()
    expect(confirm.props('modelValue')).toBe(true)
    expect(document.body.textContent).toContain(
      'Approving replaces version 1.0 for new consents; people who consented on 1.0 will appear in the re-consent queue.',
    )
  })

  it('shows a coordinator the versions and the checklist progress, without editing or approving', async () => {
    const wrapper = await openPage('coordinator')
    expect(wrapper.text()).toContain('Approved — in use')
    expect(button(wrapper, 'Add a version')).toBeUndefined()
    expect(button(wrapper, 'Approve this version')).toBeUndefined()
    expect(button(wrapper, 'Edit this draft')).toBeUndefined()
    expect(wrapper.find('.consent-form-checklist__progress').text()).toMatch(/^0 of \d+ ticked$/)
    expect(wrapper.findAll('.consent-form-checklist input[type="checkbox"]').every((box) => (box.element as HTMLInputElement).disabled)).toBe(true)
  })
})
