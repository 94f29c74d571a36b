import type { DataSource } from 'typeorm'
import type { Member } from '../../../shared/schemas/studies.js'
import type { StudyRole } from '../../../shared/permissions.js'
import { ConflictError, NotFoundError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { Membership } from './membership.entity.js'

export class MemberService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  async list(studyId: string): Promise<Member[]> {
    const rows = await this.dataSource.getRepository(Membership).find({ where: { studyId }, relations: { user: true }, order: { createdAt: 'ASC' } })
    return rows.map((m) => ({ id: m.id, userId: m.userId, name: m.user.name, email: m.user.email, role: m.role, joinedAt: m.createdAt.toISOString() }))
  }

  async changeRole(studyId: string, memberId: string, role: StudyRole, actor: AuditActor): Promise<Member> {
    await this.dataSource.transaction(async (manager) => {
      const member = await manager.findOne(Membership, { where: { id: memberId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!member) throw new NotFoundError('team member')
      if (member.role === role) return
      if (member.role === 'lead' && role !== 'lead') await this.assertAnotherLead(manager, studyId, memberId)
      await manager.update(Membership, { id: memberId }, { role })
      await this.audit.record(actor, { action: 'member.role_changed', studyId, targetType: 'user', targetId: member.userId, details: { from: member.role, to: role } }, manager)
    })
    return (await this.list(studyId)).find((m) => m.id === memberId)!
  }

  async remove(studyId: string, memberId: string, actor: AuditActor): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const member = await manager.findOne(Membership, { where: { id: memberId, studyId }, lock: { mode: 'pessimistic_write' } })
      if (!member) throw new NotFoundError('team member')
      if (member.role === 'lead') await this.assertAnotherLead(manager, studyId, memberId)
      await manager.delete(Membership, { id: memberId })
      await this.audit.record(actor, { action: 'member.removed', studyId, targetType: 'user', targetId: member.userId, details: { role: member.role } }, manager)
    })
  }

  /** A study always keeps at least one lead researcher. */
  private async assertAnotherLead(manager: import('typeorm').EntityManager, studyId: string, memberId: string) {
    const leads = await manager.find(Membership, { where: { studyId, role: 'lead' }, lock: { mode: 'pessimistic_write' } })
    if (!leads.some((l) => l.id !== memberId)) {
      throw new ConflictError('A study needs at least one lead researcher. Make someone else lead first.')
    }
  }
}
