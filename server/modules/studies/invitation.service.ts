import type { DataSource, EntityManager } from 'typeorm'
import { IsNull } from 'typeorm'
import { ROLE_LABELS } from '../../../shared/permissions.js'
import type { InvitationAccept, InvitationCreate, Invitation as InvitationDto, InvitationPreview } from '../../../shared/schemas/index.js'
import { ConflictError, ForbiddenError, GoneError, NotFoundError, ValidationError } from '../../lib/errors.js'
import { hashToken, newToken } from '../../lib/tokens.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import { assertAcceptablePassword, hashPassword, verifyPassword } from '../auth/passwords.js'
import type { MailService } from '../mail/mail.service.js'
import { User } from '../users/user.entity.js'
import { Invitation } from './invitation.entity.js'
import { Membership } from './membership.entity.js'
import { Study } from './study.entity.js'

const INVITATION_DAYS = 14

export class InvitationService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly publicUrl: string,
  ) {}

  async list(studyId: string): Promise<InvitationDto[]> {
    const rows = await this.dataSource.getRepository(Invitation).find({
      where: { studyId },
      relations: { invitedBy: true },
      order: { createdAt: 'DESC' },
    })
    return rows.map((i) => ({
      id: i.id,
      email: i.email,
      role: i.role,
      invitedBy: i.invitedBy?.name ?? 'Site administration',
      createdAt: i.createdAt.toISOString(),
      expiresAt: i.expiresAt.toISOString(),
      status: i.acceptedAt ? 'accepted' : i.revokedAt ? 'revoked' : i.expiresAt < new Date() ? 'expired' : 'open',
    }))
  }

  async create(studyId: string, input: InvitationCreate, actor: AuditActor): Promise<InvitationDto> {
    const id = await this.dataSource.transaction((manager) => this.createIn(manager, studyId, input, actor))
    const found = (await this.list(studyId)).find((i) => i.id === id)
    return found!
  }

  /** Creates the invitation and queues its e-mail inside the caller's transaction. */
  async createIn(manager: EntityManager, studyId: string, input: InvitationCreate, actor: AuditActor): Promise<string> {
    const study = await manager.findOneBy(Study, { id: studyId })
    if (!study) throw new NotFoundError('study')
    const member = await manager
      .getRepository(Membership)
      .createQueryBuilder('m')
      .innerJoin('m.user', 'u')
      .where('m.study_id = :studyId AND u.email = :email', { studyId, email: input.email })
      .getOne()
    if (member) throw new ConflictError(`${input.email} is already on this study's team. Change their role on the team page instead.`)
    // A new invitation to the same address replaces any open one.
    await manager.update(Invitation, { studyId, email: input.email, acceptedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() })
    const { token, hash } = newToken()
    const invitation = await manager.save(
      manager.create(Invitation, {
        studyId,
        email: input.email,
        role: input.role,
        tokenHash: hash,
        invitedById: actor.id,
        expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
      }),
    )
    const inviter = actor.id ? ((await manager.findOneBy(User, { id: actor.id }))?.name ?? 'The study team') : 'The site administration'
    await this.mail.enqueue(manager, {
      to: input.email,
      subject: `You are invited to join "${study.title}" on Heardwell`,
      body:
        `Hello,\n\n${inviter} invites you to join the study "${study.title}" (${study.code}) on Heardwell as ${ROLE_LABELS[input.role].toLowerCase()}.\n\n` +
        `Accept the invitation here (the link works once, for ${INVITATION_DAYS} days):\n\n${this.publicUrl}/invitations/${token}\n\n` +
        `If you did not expect this, you can ignore this message.\n`,
    })
    await this.audit.record(
      actor,
      { action: 'invitation.sent', studyId, targetType: 'invitation', targetId: invitation.id, details: { email: input.email, role: input.role } },
      manager,
    )
    return invitation.id
  }

  async revoke(studyId: string, invitationId: string, actor: AuditActor): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const invitation = await manager.findOneBy(Invitation, { id: invitationId, studyId })
      if (!invitation) throw new NotFoundError('invitation')
      if (invitation.acceptedAt) throw new ConflictError('This invitation was already accepted. Remove the member from the team instead.')
      if (invitation.revokedAt) return
      await manager.update(Invitation, { id: invitationId }, { revokedAt: new Date() })
      await this.audit.record(actor, { action: 'invitation.revoked', studyId, targetType: 'invitation', targetId: invitationId, details: { email: invitation.email } }, manager)
    })
  }

  private async usable(manager: EntityManager, token: string, lock = false): Promise<Invitation & { study: Study }> {
    const invitation = await manager.findOne(Invitation, {
      where: { tokenHash: hashToken(token) },
      relations: { study: true, invitedBy: true },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const, tables: ['invitations'] } } : {}),
    })
    if (!invitation) throw new GoneError('This invitation link is not valid. Ask the study lead to send a new invitation.')
    if (invitation.acceptedAt) throw new GoneError('This invitation was already used. Sign in instead, or ask the study lead for a new invitation.')
    if (invitation.revokedAt || invitation.expiresAt < new Date()) {
      throw new GoneError('This invitation has expired or was withdrawn. Ask the study lead to send a new one.')
    }
    return invitation as Invitation & { study: Study }
  }

  async preview(token: string): Promise<InvitationPreview> {
    const invitation = await this.usable(this.dataSource.manager, token)
    return {
      email: invitation.email,
      role: invitation.role,
      studyTitle: invitation.study.title,
      invitedBy: invitation.invitedBy?.name ?? 'The site administration',
      accountExists: await this.dataSource.getRepository(User).existsBy({ email: invitation.email }),
      expiresAt: invitation.expiresAt.toISOString(),
    }
  }

  /** Accepting creates the account (new invitee) or checks the password (existing account); returns the user. */
  async accept(token: string, input: InvitationAccept, actor: AuditActor): Promise<{ user: User; studyId: string }> {
    return this.dataSource.transaction(async (manager) => {
      const invitation = await this.usable(manager, token, true)
      let user = await manager.findOneBy(User, { email: invitation.email })
      if (user) {
        if (user.disabled || !user.passwordHash || !(await verifyPassword(user.passwordHash, input.password))) {
          throw new ForbiddenError('The password is not right for this account.')
        }
      } else {
        if (!input.name) throw new ValidationError('Tell us your name.', [{ path: 'name', message: 'Your name is required.' }])
        assertAcceptablePassword(input.password, [invitation.email, input.name, invitation.study.title])
        user = await manager.save(
          manager.create(User, { email: invitation.email, name: input.name, passwordHash: await hashPassword(input.password), passwordChangedAt: new Date() }),
        )
      }
      const existing = await manager.findOneBy(Membership, { studyId: invitation.studyId, userId: user.id })
      if (!existing) await manager.insert(Membership, { studyId: invitation.studyId, userId: user.id, role: invitation.role })
      await manager.update(Invitation, { id: invitation.id }, { acceptedAt: new Date() })
      await this.audit.record(
        { ...actor, id: user.id, email: user.email },
        { action: 'invitation.accepted', studyId: invitation.studyId, targetType: 'invitation', targetId: invitation.id, details: { role: invitation.role } },
        manager,
      )
      return { user, studyId: invitation.studyId }
    })
  }
}
