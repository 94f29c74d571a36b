import type { IncomingMessage } from 'node:http'
import passport from 'passport'
import type { DataSource } from 'typeorm'

/**
 * Passport keeps only the user id in the session and reloads the account on every request (with the
 * session itself, see session.ts), so a disabled account stops working at once. Credentials are checked in AuthService (with throttling
 * and audit) and the session is established with `req.login`, which regenerates the session id.
 */
export function configurePassport(dataSource: DataSource): passport.PassportStatic {
  const instance = new passport.Passport()
  instance.serializeUser((user, done) => done(null, user.id))
  instance.deserializeUser((req: IncomingMessage, id: string, done: (error: unknown, user?: Express.User | false) => void) => {
    // every request: the account was read with the session, in the same statement (session.ts)
    const read = (req as IncomingMessage & Pick<Express.Request, 'account'>).account
    if (read && read.userId === id) {
      const user = read.user
      return done(null, user && !user.disabled ? { id: user.id, email: user.email, name: user.name, siteAdmin: user.siteAdmin } : false)
    }
    // else one plain query for the few columns needed (a disabled account stops at once)
    dataSource
      .query('SELECT id, email, name, site_admin, disabled FROM users WHERE id = $1', [id])
      .then(([user]: { id: string; email: string; name: string; site_admin: boolean; disabled: boolean }[]) =>
        done(null, user && !user.disabled ? { id: user.id, email: user.email, name: user.name, siteAdmin: user.site_admin } : false),
      )
      .catch((error) => done(error))
  })
  return instance as unknown as passport.PassportStatic
}
