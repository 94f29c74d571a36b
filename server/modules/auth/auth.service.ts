import type { DataSource } from 'typeorm'
import type { MeResponse, PasswordChangeRequest, PasswordResetConfirm } from '../../../shared/schemas/auth.js'
import { ForbiddenError, GoneError, UnauthenticatedError } from '../../lib/errors.js'
import { hashToken, newToken } from '../../lib/tokens.js'
import type { AuditActor, AuditService } from '../audit/audit.service.js'
import type { MailService } from '../mail/mail.service.js'
import { Membership } from '../studies/membership.entity.js'
import { User } from '../users/user.entity.js'
import { assertAcceptablePassword, dummyVerify, hashPassword, needsRehash, verifyPassword } from './passwords.js'
import { PasswordResetToken } from './password-reset-token.entity.js'
import type { SessionRevoker } from './session-store.js'
import type { SignInThrottle } from './sign-in-throttle.js'

const RESET_MINUTES = 30
const WRONG_CREDENTIALS = 'The e-mail or password is not right.'

export class AuthService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly throttle: SignInThrottle,
    private readonly sessions: SessionRevoker,
    private readonly publicUrl: string,
  ) {}

  /** Checks the credentials; the same answer for an unknown e-mail and a wrong password. */
  async verifyCredentials(email: string, password: string, actor: AuditActor): Promise<User> {
    await this.throttle.check(email, actor.ip ?? 'unknown').catch(async (error) => {
      await this.audit.record({ ...actor, email }, { action: 'auth.sign_in_throttled' })
      throw error
    })
    const users = this.dataSource.getRepository(User)
    const user = await users.findOneBy({ email })
    const ok = user?.passwordHash ? await verifyPassword(user.passwordHash, password) : await dummyVerify(password)
    if (!user || !ok || user.disabled) {
      await this.throttle.failed(email, actor.ip ?? 'unknown')
      await this.audit.record({ ...actor, id: user?.id ?? null, email }, { action: 'auth.sign_in_failed', details: { reason: 'credentials' } })
      throw new UnauthenticatedError(WRONG_CREDENTIALS)
    }
    await this.throttle.succeeded(email)
    if (needsRehash(user.passwordHash!)) {
      await users.update({ id: user.id }, { passwordHash: await hashPassword(password) })
    }
    await this.audit.record({ ...actor, id: user.id, email: user.email }, { action: 'auth.signed_in', targetType: 'user', targetId: user.id })
    return user
  }

  async me(userId: string): Promise<MeResponse> {
    const user = await this.dataSource.getRepository(User).findOneByOrFail({ id: userId })
    const memberships = await this.dataSource.getRepository(Membership).find({
      where: { userId },
      relations: { study: true },
      order: { study: { title: 'ASC' } },
    })
    return {
      user: { id: user.id, email: user.email, name: user.name, siteAdmin: user.siteAdmin },
      memberships: memberships.map((m) => ({ studyId: m.studyId, role: m.role, studyTitle: m.study.title, studyCode: m.study.code })),
    }
  }

  /** Always answers the same way, whether or not the e-mail has an account (ASVS 6.3.8). */
  async requestPasswordReset(email: string, actor: AuditActor): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const user = await manager.findOneBy(User, { email })
      if (!user || user.disabled) {
        await this.audit.record({ ...actor, email }, { action: 'auth.password_reset_requested', details: { known: false } }, manager)
        return
      }
      await this.issueResetLink(manager, user, 'reset')
      await this.audit.record({ ...actor, id: null, email }, { action: 'auth.password_reset_requested', targetType: 'user', targetId: user.id }, manager)
    })
  }

  /** Creates a single-use link (stored hashed) and queues the e-mail; used for resets and new accounts. */
  async issueResetLink(manager: import('typeorm').EntityManager, user: User, purpose: 'reset' | 'welcome'): Promise<void> {
    const { token, hash } = newToken()
    const minutes = purpose === 'welcome' ? 7 * 24 * 60 : RESET_MINUTES
    await manager.insert(PasswordResetToken, { userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + minutes * 60_000) })
    const link = `${this.publicUrl}/reset-password/${token}`
    await this.mail.enqueue(manager, {
      to: user.email,
      subject: purpose === 'welcome' ? 'Your Heardwell account: choose a password' : 'Reset your Heardwell password',
      body:
        purpose === 'welcome'
          ? `Hello ${user.name},\n\nAn account on Heardwell has been created for you. Choose your password here (the link works once, for 7 days):\n\n${link}\n`
          : `Hello ${user.name},\n\nSomeone asked to reset the password of your Heardwell account. If it was you, choose a new password here (the link works once, for ${RESET_MINUTES} minutes):\n\n${link}\n\nIf it was not you, you can ignore this message; your password has not changed.\n`,
    })
  }

  async confirmPasswordReset(input: PasswordResetConfirm, actor: AuditActor): Promise<void> {
    const userId = await this.dataSource.transaction(async (manager) => {
      const record = await manager.findOne(PasswordResetToken, {
        where: { tokenHash: hashToken(input.token) },
        relations: { user: true },
        lock: { mode: 'pessimistic_write', tables: ['password_reset_tokens'] },
      })
      if (!record || record.usedAt || record.expiresAt < new Date() || record.user.disabled) {
        throw new GoneError('This password link has expired or was already used. Ask for a new one from the sign-in page.')
      }
      assertAcceptablePassword(input.password, [record.user.email, record.user.name])
      await manager.update(PasswordResetToken, { id: record.id }, { usedAt: new Date() })
      await manager.update(User, { id: record.userId }, { passwordHash: await hashPassword(input.password), passwordChangedAt: new Date() })
      await this.audit.record({ ...actor, id: record.userId, email: record.user.email }, { action: 'auth.password_reset', targetType: 'user', targetId: record.userId }, manager)
      return record.userId
    })
    await this.sessions.revokeAll(userId)
  }

  async changePassword(userId: string, sid: string, input: PasswordChangeRequest, actor: AuditActor): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const user = await manager.findOneByOrFail(User, { id: userId })
      if (!user.passwordHash || !(await verifyPassword(user.passwordHash, input.currentPassword))) {
        throw new ForbiddenError('Your current password is not right.')
      }
      assertAcceptablePassword(input.newPassword, [user.email, user.name], 'newPassword')
      await manager.update(User, { id: userId }, { passwordHash: await hashPassword(input.newPassword), passwordChangedAt: new Date() })
      await this.audit.record(actor, { action: 'auth.password_changed', targetType: 'user', targetId: userId }, manager)
      // Tell the person, in case it was not them (ASVS 6.3.7).
      await this.mail.enqueue(manager, {
        to: user.email,
        subject: 'Your Heardwell password was changed',
        body: `Hello ${user.name},\n\nThe password of your Heardwell account was changed. If this was not you, reset your password at ${this.publicUrl}/forgot-password and tell your study lead.\n`,
      })
    })
    if (input.signOutOtherSessions) await this.sessions.revokeAll(userId, sid)
  }
}
