import { randomBytes } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { StudyRole } from '../../shared/permissions.js'
import { hashPassword } from '../../server/modules/auth/passwords.js'
import { Membership } from '../../server/modules/studies/membership.entity.js'
import { Study } from '../../server/modules/studies/study.entity.js'
import { User } from '../../server/modules/users/user.entity.js'

export const TEST_PASSWORD = 'quiet river lantern morning'
let cachedHash: Promise<string> | null = null

export function uniqueEmail(prefix = 'person'): string {
  return `${prefix}-${randomBytes(4).toString('hex')}@example.org`
}

export async function makeUser(ds: DataSource, fields: Partial<User> = {}): Promise<User> {
  cachedHash ??= hashPassword(TEST_PASSWORD)
  return ds.getRepository(User).save(
    ds.getRepository(User).create({ email: uniqueEmail(), name: 'Test Person', passwordHash: await cachedHash, ...fields }),
  )
}

export async function makeStudy(ds: DataSource, fields: Partial<Study> = {}): Promise<Study> {
  const code = `T${randomBytes(3).toString('hex').toUpperCase()}`
  return ds.getRepository(Study).save(ds.getRepository(Study).create({ code, title: `Test study ${code}`, ...fields }))
}

export async function addMember(ds: DataSource, study: Study, user: User, role: StudyRole): Promise<Membership> {
  return ds.getRepository(Membership).save(ds.getRepository(Membership).create({ studyId: study.id, userId: user.id, role }))
}

/** A study with one member per role, and a second study with its own lead (the "outsider"). */
export async function makeTeam(ds: DataSource) {
  const study = await makeStudy(ds)
  const other = await makeStudy(ds)
  const users = {
    lead: await makeUser(ds, { email: uniqueEmail('lead'), name: 'Lead Person' }),
    coordinator: await makeUser(ds, { email: uniqueEmail('coordinator') }),
    coder: await makeUser(ds, { email: uniqueEmail('coder') }),
    partner: await makeUser(ds, { email: uniqueEmail('partner') }),
    admin: await makeUser(ds, { email: uniqueEmail('admin'), siteAdmin: true }),
    outsider: await makeUser(ds, { email: uniqueEmail('outsider') }),
  }
  const memberships = {
    lead: await addMember(ds, study, users.lead, 'lead'),
    coordinator: await addMember(ds, study, users.coordinator, 'coordinator'),
    coder: await addMember(ds, study, users.coder, 'coder'),
    partner: await addMember(ds, study, users.partner, 'partner'),
    outsider: await addMember(ds, other, users.outsider, 'lead'),
  }
  return { study, other, users, memberships }
}
