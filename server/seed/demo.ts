import type { DataSource } from 'typeorm'
import type { Logger } from '../lib/logger.js'
import type { ObjectStore } from '../storage/object-store.js'
import { seedDemoConsent } from './demo-consent.js'
import { seedDemoInterviews } from './demo-transcripts.js'
import { seedDemoCoding } from './demo-coding.js'
import { seedDemoThemes } from './demo-themes.js'
import { AuditEvent } from '../modules/audit/audit-event.entity.js'
import { hashPassword } from '../modules/auth/passwords.js'
import { Membership } from '../modules/studies/membership.entity.js'
import { Study } from '../modules/studies/study.entity.js'
import { User } from '../modules/users/user.entity.js'
import { DEMO_ADMIN, DEMO_PASSWORD, DEMO_STUDY, DEMO_TEAM } from './demo-data.js'
import { DEMO_QUESTIONNAIRE, DEMO_RECRUITMENT } from './demo-questionnaire.js'
import { seedDemoParticipants } from './demo-participants.js'
import { ScreeningQuestionnaire } from '../modules/recruitment/screening-questionnaire.entity.js'

/**
 * Loads the demo study and one account per role. Idempotent: what exists is left as it is.
 * Refused in production, where demo accounts with a published password must never exist.
 */
/** With an object store, the demo also gets its consent form files and consent records. */
export async function seedDemo(dataSource: DataSource, nodeEnv: string, log?: Logger, storage?: ObjectStore): Promise<{ studyId: string }> {
  if (nodeEnv === 'production') throw new Error('Refusing to load demo data with NODE_ENV=production.')
  return dataSource.transaction(async (manager) => {
    const passwordHash = await hashPassword(DEMO_PASSWORD)
    const userIds = new Map<string, string>()
    for (const person of [{ ...DEMO_ADMIN, siteAdmin: true }, ...DEMO_TEAM.map((p) => ({ ...p, siteAdmin: false }))]) {
      let user = await manager.findOneBy(User, { email: person.email })
      user ??= await manager.save(manager.create(User, { email: person.email, name: person.name, siteAdmin: person.siteAdmin, passwordHash }))
      userIds.set(person.email, user.id)
    }
    let study = await manager.findOneBy(Study, { code: DEMO_STUDY.code })
    let created = false
    if (!study) {
      study = await manager.save(manager.create(Study, { ...DEMO_STUDY, ...DEMO_RECRUITMENT, coderComparison: true }))
      created = true
    }
    for (const member of DEMO_TEAM) {
      const userId = userIds.get(member.email)!
      if (!(await manager.existsBy(Membership, { studyId: study.id, userId }))) {
        await manager.insert(Membership, { studyId: study.id, userId, role: member.role })
      }
    }
    if (created) {
      const coordinator = DEMO_TEAM.find((m) => m.role === 'coordinator')!
      const questionnaire = await manager.save(
        manager.create(ScreeningQuestionnaire, { studyId: study.id, version: 1, ...DEMO_QUESTIONNAIRE, createdById: userIds.get(DEMO_TEAM[0]!.email)! }),
      )
      await seedDemoParticipants(manager, study, questionnaire, userIds.get(coordinator.email)!, coordinator.name)
      if (storage) {
        const lead = DEMO_TEAM.find((m) => m.role === 'lead')!
        await seedDemoConsent(manager, study, storage, { id: userIds.get(lead.email)!, name: lead.name }, { id: userIds.get(coordinator.email)!, name: coordinator.name })
        await seedDemoInterviews(manager, study, storage, { lead: userIds.get(lead.email)!, coordinator: userIds.get(coordinator.email)! })
        const coders = DEMO_TEAM.filter((m) => m.role === 'coder').map((m) => userIds.get(m.email)!)
        await seedDemoCoding(manager, study, { lead: userIds.get(lead.email)!, coder1: coders[0]!, coder2: coders[1]! })
        const partner = DEMO_TEAM.find((m) => m.role === 'partner')!
        await seedDemoThemes(manager, study, { coder1: coders[0]!, partner: userIds.get(partner.email)! })
      }
      await manager.getRepository(AuditEvent).save(
        manager.create(AuditEvent, {
          action: 'study.created',
          actorEmail: DEMO_ADMIN.email,
          actorId: userIds.get(DEMO_ADMIN.email)!,
          studyId: study.id,
          targetType: 'study',
          targetId: study.id,
          details: { code: study.code, source: 'demo data' },
        }),
        { reload: false },
      )
      log?.info({ study: study.code }, 'demo study loaded')
    }
    return { studyId: study.id }
  })
}
