import { afterEach, describe, expect, it } from 'vitest'
import AppNavigation from '@/components/app/AppNavigation.vue'
import { createTestApp, mountView, signInAs } from './support'

async function linksFor(role: Parameters<typeof signInAs>[0], siteAdmin = false) {
  const app = createTestApp()
  signInAs(role, siteAdmin)
  const { wrapper } = await mountView(AppNavigation, {
    app,
    path: '/studies/study-1',
    props: { studyId: 'study-1', studyTitle: 'Coming Home After Stroke' },
  })
  const nav = wrapper.find('[role="navigation"]')
  return { nav, titles: wrapper.findAll('.v-list-item-title').map((t) => t.text()) }
}

describe('main navigation', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('is a labelled navigation landmark', async () => {
    const { nav } = await linksFor('lead')
    expect(nav.exists()).toBe(true)
    expect(nav.attributes('aria-label')).toBe('Main')
  })

  it('hides the audit trail from a coder', async () => {
    const { titles } = await linksFor('coder')
    expect(titles).toContain('Overview')
    expect(titles).toContain('Team')
    expect(titles).not.toContain('Audit trail')
  })

  it('shows the audit trail to the lead researcher, linking to the study audit page', async () => {
    const { nav, titles } = await linksFor('lead')
    expect(titles).toContain('Audit trail')
    expect(nav.find('a[href="/studies/study-1/audit"]').exists()).toBe(true)
  })

  it('shows site administration only to the site administrator', async () => {
    expect((await linksFor('partner')).titles).not.toContain('Site administration')
    expect((await linksFor(null, true)).titles).toContain('Site administration')
  })
})

describe('recruitment sections in the navigation', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('shows Participants to a coder but not to a patient partner', async () => {
    expect((await linksFor('coder')).titles).toContain('Participants')
    expect((await linksFor('partner')).titles).not.toContain('Participants')
  })

  it('shows Recruitment to a patient partner, linking to the counts page, but not the screening questions', async () => {
    const { nav, titles } = await linksFor('partner')
    expect(titles).toContain('Recruitment')
    expect(titles).not.toContain('Screening questions')
    expect(nav.find('a[href="/studies/study-1/recruitment"]').exists()).toBe(true)
  })

  it('lists Recruitment, Participants, the consent sections, Interviews, Transcripts and Screening questions right after Overview for the lead researcher', async () => {
    const { titles } = await linksFor('lead')
    expect(titles.slice(titles.indexOf('Overview'), titles.indexOf('Overview') + 8)).toEqual([
      'Overview',
      'Recruitment',
      'Participants',
      'Consent',
      'Consent forms',
      'Interviews',
      'Transcripts',
      'Screening questions',
    ])
  })
})

describe('consent sections in the navigation', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('shows Consent and Consent forms to a coordinator, linking to their pages', async () => {
    const { nav, titles } = await linksFor('coordinator')
    expect(titles).toContain('Consent')
    expect(titles).toContain('Consent forms')
    expect(nav.find('a[href="/studies/study-1/consent"]').exists()).toBe(true)
    expect(nav.find('a[href="/studies/study-1/consent-forms"]').exists()).toBe(true)
  })

  it('hides Consent and Consent forms from a coder and a patient partner', async () => {
    for (const role of ['coder', 'partner'] as const) {
      const { titles } = await linksFor(role)
      expect(titles).not.toContain('Consent')
      expect(titles).not.toContain('Consent forms')
    }
  })
})

describe('interview and transcript sections in the navigation', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('shows Transcripts to a coder, linking to the transcripts page, but not Interviews', async () => {
    const { nav, titles } = await linksFor('coder')
    expect(titles).toContain('Transcripts')
    expect(titles).not.toContain('Interviews')
    expect(nav.find('a[href="/studies/study-1/transcripts"]').exists()).toBe(true)
    expect(nav.find('a[href="/studies/study-1/interviews"]').exists()).toBe(false)
  })

  it('shows both Interviews and Transcripts to a coordinator and neither to a patient partner', async () => {
    const coordinator = await linksFor('coordinator')
    expect(coordinator.titles).toEqual(expect.arrayContaining(['Interviews', 'Transcripts']))
    expect(coordinator.nav.find('a[href="/studies/study-1/interviews"]').exists()).toBe(true)
    const partner = await linksFor('partner')
    expect(partner.titles).not.toContain('Interviews')
    expect(partner.titles).not.toContain('Transcripts')
  })
})
