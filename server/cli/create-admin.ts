import { createDataSource } from '../db/data-source.js'
import { email as emailSchema, requiredText } from '../../shared/schemas/common.js'
import { newToken } from '../lib/tokens.js'
import { PasswordResetToken } from '../modules/auth/password-reset-token.entity.js'
import { AuditEvent } from '../modules/audit/audit-event.entity.js'
import { User } from '../modules/users/user.entity.js'

/**
 * `npm run db:create-admin -- someone@example.org "Their Name"`: creates the first site administrator
 * (or makes an existing account one) and prints a single-use link, valid for 24 hours, where that
 * person chooses their own password. No password is ever set or shown here (ASVS 5.0 6.4.6).
 */
const [rawEmail, rawName] = process.argv.slice(2)
const url = process.env.DATABASE_URL
const publicUrl = (process.env.PUBLIC_URL ?? 'http://127.0.0.1:3000').replace(/\/$/, '')
const email = emailSchema.safeParse(rawEmail ?? '')
const name = requiredText(120, 'The name').safeParse(rawName ?? '')
if (!url || !email.success || !name.success) {
  console.error('Usage: DATABASE_URL=… PUBLIC_URL=… npm run db:create-admin -- email@example.org "Full Name"')
  process.exit(1)
}
const dataSource = await createDataSource(url).initialize()
try {
  const link = await dataSource.transaction(async (manager) => {
    let user = await manager.findOneBy(User, { email: email.data })
    user = user
      ? await manager.save(Object.assign(user, { siteAdmin: true, disabled: false }))
      : await manager.save(manager.create(User, { email: email.data, name: name.data, siteAdmin: true }))
    const { token, hash } = newToken()
    await manager.insert(PasswordResetToken, { userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + 24 * 3_600_000) })
    await manager.getRepository(AuditEvent).save(
      manager.create(AuditEvent, { action: 'user.site_admin_created', targetType: 'user', targetId: user.id, details: { email: user.email, source: 'command line' } }),
      { reload: false },
    )
    return `${publicUrl}/reset-password/${token}`
  })
  console.log(`${email.data} is a site administrator. Send them this single-use link (24 hours) to choose a password:\n${link}`)
} finally {
  await dataSource.destroy()
}
