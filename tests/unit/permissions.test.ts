import { describe, expect, it } from 'vitest'
import { can, decide, STUDY_ACTIONS, STUDY_ROLES } from '../../shared/permissions.js'

describe('permission matrix', () => {
  it('answers unauthenticated for everything but public routes when signed out', () => {
    const anon = { signedIn: false, siteAdmin: false, role: null }
    expect(decide(anon, 'public')).toBe('allow')
    expect(decide(anon, 'signedIn')).toBe('unauthenticated')
    expect(decide(anon, 'study:study.read')).toBe('unauthenticated')
    expect(decide(anon, 'site:users.manage')).toBe('unauthenticated')
  })

  it('keeps the audit trail and team management with the lead only', () => {
    for (const role of STUDY_ROLES) {
      expect(can(role, false, 'audit.read')).toBe(role === 'lead')
      expect(can(role, false, 'members.manage')).toBe(role === 'lead')
    }
  })

  it('lets the site administrator see a study\'s set-up and team but not its trail or team changes', () => {
    expect(can(null, true, 'study.read')).toBe(true)
    expect(can(null, true, 'members.read')).toBe(true)
    expect(can(null, true, 'study.assignLead')).toBe(true)
    expect(can(null, true, 'audit.read')).toBe(false)
    expect(can(null, true, 'members.manage')).toBe(false)
    expect(can(null, true, 'study.update')).toBe(false)
  })

  it('denies every study action to a signed-in person who is not a member', () => {
    for (const action of Object.keys(STUDY_ACTIONS) as (keyof typeof STUDY_ACTIONS)[]) {
      expect(decide({ signedIn: true, siteAdmin: false, role: null }, `study:${action}`)).toBe('forbidden')
    }
  })

  it('keeps site actions with the site administrator, whatever study role a person holds', () => {
    expect(decide({ signedIn: true, siteAdmin: false, role: 'lead' }, 'site:studies.create')).toBe('forbidden')
    expect(decide({ signedIn: true, siteAdmin: true, role: null }, 'site:studies.create')).toBe('allow')
  })
})
