import { afterEach, describe, expect, it } from 'vitest'
import type { ParticipantRow } from '@shared/schemas/recruitment'
import ParticipantTable from '@/components/recruitment/ParticipantTable.vue'
import { mountView, signInAs, createTestApp } from './support'

const row: ParticipantRow = {
  id: 'p-1',
  pseudonym: 'P01',
  status: 'eligible',
  helpSeeking: false,
  source: 'clinic_referral',
  characteristics: { region: 'north' },
  lastActivityAt: '2026-03-02T10:00:00.000Z',
}
const withContact: ParticipantRow = {
  ...row,
  contact: { name: 'Robin Invented', email: 'robin@example.test', phone: '+1 555 0100', country: 'Canada', timeZone: 'America/Toronto' },
}

async function mountTable(rows: ParticipantRow[], canOpen = false) {
  const app = createTestApp()
  signInAs(canOpen ? 'coordinator' : 'coder')
  const { wrapper } = await mountView(ParticipantTable, {
    app,
    path: '/studies/study-1/participants',
    props: {
      page: { participants: rows, total: rows.length, page: 1, pageSize: 25 },
      loading: false,
      canOpen,
      describe: (c: Record<string, string>) => Object.values(c).join(', '),
      noDataText: 'Nobody matches these filters.',
      pageNumber: 1,
      pageSize: 25,
      sortBy: [],
    },
  })
  const headers = wrapper.findAll('th').map((th) => th.text())
  return { wrapper, headers }
}

describe('the participants table', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('hides the contact columns when the rows carry no contact details (a coder)', async () => {
    const { wrapper, headers } = await mountTable([row])
    expect(headers).toContain('Pseudonym')
    expect(headers).not.toContain('Name')
    expect(headers).not.toContain('E-mail')
    expect(headers).not.toContain('Phone')
    expect(wrapper.text()).toContain('P01')
    expect(wrapper.text()).toContain('Eligible')
    expect(wrapper.find('a[href="/studies/study-1/participants/p-1"]').exists()).toBe(false)
  })

  it('shows name, e-mail and phone when the server sent them, and links the pseudonym to the record', async () => {
    const { wrapper, headers } = await mountTable([withContact], true)
    expect(headers).toEqual(expect.arrayContaining(['Name', 'E-mail', 'Phone']))
    expect(wrapper.text()).toContain('robin@example.test')
    expect(wrapper.find('a[href="/studies/study-1/participants/p-1"]').exists()).toBe(true)
  })
})
