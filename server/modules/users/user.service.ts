import type { DataSource } from 'typeorm'
import type { SiteUser, UserCreate } from '../../../shared/schemas/users.js'
import { ConflictError, NotFoundError } from '../../lib/errors.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { AuthService } from '../auth/auth.service.js'
import type { SessionRevoker } from '../auth/session-store.js'
import { User } from './user.entity.js'

/** Accounts, managed by the site administrator. Administrators never choose or see passwords. */
export class UserService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly auth: AuthService,
    private readonly sessions: SessionRevoker,
  ) {}

  private toDto(u: User): SiteUser {
    return { id: u.id, email: u.email, name: u.name, siteAdmin: u.siteAdmin, disabled: u.disabled, createdAt: u.createdAt.toISOString() }
  }

  async list(): Promise<SiteUser[]> {
    return (await this.dataSource.getRepository(User).find({ order: { name: 'ASC' } })).map((u) => this.toDto(u))
  }

  /** Creates the account and e-mails a single-use link to choose a password. */
  async create(input: UserCreate, actor: AuditActor): Promise<SiteUser> {
    return this.dataSource.transaction(async (manager) => {
      if (await manager.existsBy(User, { email: input.email })) throw new ConflictError(`An account for ${input.email} already exists.`)
      const user = await manager.save(manager.create(User, { email: input.email, name: input.name, siteAdmin: input.siteAdmin }))
      await this.auth.issueResetLink(manager, user, 'welcome')
      await this.audit.record(actor, { action: 'user.created', targetType: 'user', targetId: user.id, details: { email: user.email, siteAdmin: user.siteAdmin } }, manager)
      return this.toDto(user)
    })
  }

  /** Disabling an account ends all of its sessions at once (ASVS 7.4.2). */
  async setDisabled(userId: string, disabled: boolean, actor: AuditActor): Promise<SiteUser> {
    const user = await this.dataSource.transaction(async (manager) => {
      const found = await manager.findOneBy(User, { id: userId })
      if (!found) throw new NotFoundError('account')
      if (found.id === actor.id && disabled) throw new ConflictError('You cannot disable your own account.')
      await manager.update(User, { id: userId }, { disabled })
      await this.audit.record(actor, { action: disabled ? 'user.disabled' : 'user.enabled', targetType: 'user', targetId: userId }, manager)
      return { ...found, disabled } as User
    })
    if (disabled) await this.sessions.revokeAll(userId)
    return this.toDto(user)
  }
}
