import 'reflect-metadata'
import { randomUUID } from 'node:crypto'
import { existsSync } from 'node:fs'
import path from 'node:path'
import express, { type NextFunction, type Request, type Response } from 'express'
import type { Pool } from 'pg'
import type PgBoss from 'pg-boss'
import type { Transporter } from 'nodemailer'
import type { DataSource } from 'typeorm'
import { csrfSync } from 'csrf-sync'
import type { Config } from './config.js'
import { AppError } from './lib/errors.js'
import type { Logger } from './lib/logger.js'
import { createAuthorize } from './middleware/authorize.js'
import { apiNotFound, createErrorHandler } from './middleware/errors.js'
import { noStore, sameOriginWrites, securityHeaders } from './middleware/security.js'
import { auditRouter } from './modules/audit/audit.router.js'
import { AuditService } from './modules/audit/audit.service.js'
import { authRouter } from './modules/auth/auth.router.js'
import { AuthService } from './modules/auth/auth.service.js'
import { configurePassport } from './modules/auth/passport.js'
import { createSessionMiddleware, enforceAbsoluteLimit } from './modules/auth/session.js'
import { SessionRevoker } from './modules/auth/session-store.js'
import { SignInThrottle } from './modules/auth/sign-in-throttle.js'
import { healthRouter } from './modules/health/health.router.js'
import { mailboxRouter } from './modules/mail/mailbox.router.js'
import { MailService } from './modules/mail/mail.service.js'
import { InvitationService } from './modules/studies/invitation.service.js'
import { invitationsRouter } from './modules/studies/invitations.router.js'
import { MemberService } from './modules/studies/member.service.js'
import { membersRouter } from './modules/studies/members.router.js'
import { StudyService } from './modules/studies/study.service.js'
import { studiesRouter } from './modules/studies/studies.router.js'
import { UserService } from './modules/users/user.service.js'
import { usersRouter } from './modules/users/users.router.js'
import type { ObjectStore } from './storage/object-store.js'
import { ConsentFormService } from './modules/consent/consent-form.service.js'
import { consentFormsRouter } from './modules/consent/consent-forms.router.js'
import { ConsentSummaryService } from './modules/consent/consent-summary.service.js'
import { consentRouter } from './modules/consent/consent.router.js'
import { ConsentService } from './modules/consent/consent.service.js'
import { publicConsentRouter } from './modules/consent/public-consent.router.js'
import { WithdrawalService } from './modules/consent/withdrawal.service.js'
import { exportsRouter } from './modules/recruitment/exports.router.js'
import { ParticipantService } from './modules/recruitment/participant.service.js'
import { participantsRouter } from './modules/recruitment/participants.router.js'
import { publicRouter } from './modules/recruitment/public.router.js'
import { QuestionnaireService } from './modules/recruitment/questionnaire.service.js'
import { RecruitmentSettingsService } from './modules/recruitment/recruitment-settings.service.js'
import { RecruitmentSummaryService } from './modules/recruitment/recruitment-summary.service.js'
import { recruitmentRouter } from './modules/recruitment/recruitment.router.js'
import { ScreeningLogService } from './modules/recruitment/screening-log.service.js'

export interface AppDeps {
  config: Config
  dataSource: DataSource
  storage: ObjectStore
  boss: PgBoss
  mailTransport: Transporter
  log: Logger
  /** the fake SMTP server's folder, for the development mailbox; absent in production */
  mailboxDir?: string
}

/** The app's pg pool: TypeORM's, shared with the session store and the sign-in throttle. */
export function poolOf(dataSource: DataSource): Pool {
  return (dataSource.driver as unknown as { master: Pool }).master
}

/** Builds the Express app (no listen: tests drive it with supertest). */
export function createApp(deps: AppDeps) {
  const { config, dataSource, storage, boss, mailTransport, log } = deps
  const pool = poolOf(dataSource)
  const secure = config.PUBLIC_URL.startsWith('https:')
  const publicUrl = config.PUBLIC_URL.replace(/\/$/, '')

  const audit = new AuditService(dataSource)
  const mail = new MailService(dataSource, boss, config.MAIL_FROM, log, storage)
  const sessions = new SessionRevoker(pool)
  const throttle = new SignInThrottle(pool, {
    perAccount: config.LOGIN_FAILURES_PER_ACCOUNT,
    perAddress: config.LOGIN_FAILURES_PER_ADDRESS,
    windowMinutes: config.LOGIN_WINDOW_MINUTES,
  })
  const auth = new AuthService(dataSource, audit, mail, throttle, sessions, publicUrl)
  const invitations = new InvitationService(dataSource, audit, mail, publicUrl)
  const studies = new StudyService(dataSource, audit, invitations)
  const members = new MemberService(dataSource, audit)
  const users = new UserService(dataSource, audit, auth, sessions)
  const questionnaires = new QuestionnaireService(dataSource, audit)
  const participants = new ParticipantService(dataSource, audit, mail, questionnaires)
  const recruitmentSettings = new RecruitmentSettingsService(dataSource, audit)
  const summaries = new RecruitmentSummaryService(dataSource)
  const screeningLog = new ScreeningLogService(dataSource, audit)
  const consentForms = new ConsentFormService(dataSource, storage, audit)
  const consent = new ConsentService(dataSource, storage, audit, mail, publicUrl, config.SESSION_SECRET)
  const withdrawals = new WithdrawalService(dataSource, audit, mail)
  const consentSummaries = new ConsentSummaryService(dataSource, withdrawals)
  const authorize = createAuthorize(dataSource)
  const passport = configurePassport(dataSource)
  const csrf = csrfSync({
    getTokenFromRequest: (req) => req.get('x-csrf-token'),
    getTokenFromState: (req) => req.session.csrfToken,
    storeTokenInState: (req, token) => {
      req.session.csrfToken = token
    },
  })

  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', config.TRUST_PROXY)
  app.set('query parser', 'simple')

  app.use((req: Request, res: Response, next: NextFunction) => {
    req.requestId = randomUUID()
    req.log = log.child({ requestId: req.requestId })
    res.setHeader('X-Request-Id', req.requestId)
    next()
  })
  app.use(securityHeaders(secure))
  app.use((req, res, next) => {
    if (req.method === 'TRACE' || req.method === 'TRACK') return res.status(405).end()
    next()
  })

  const api = express.Router()
  api.use(noStore)
  api.use(sameOriginWrites(new URL(publicUrl).origin))
  api.use(express.json({ limit: '1mb', strict: true }))
  api.use(createSessionMiddleware(pool, {
    secret: config.SESSION_SECRET,
    secure,
    idleMinutes: config.SESSION_IDLE_MINUTES,
    absoluteHours: config.SESSION_ABSOLUTE_HOURS,
    pruneSessions: config.NODE_ENV !== 'test',
  }))
  api.use(passport.session())
  api.use(enforceAbsoluteLimit(config.SESSION_ABSOLUTE_HOURS))
  api.use((req, res, next) =>
    csrf.csrfSynchronisedProtection(req, res, (error?: unknown) => {
      if (error) return next(new AppError(403, 'csrf', 'Security check failed', 'The page had expired. Reload it and try again.'))
      next()
    }),
  )

  api.use(healthRouter({ authorize, dataSource, storage, checkMail: () => mailTransport.verify() }))
  api.use(authRouter({ authorize, auth, audit, sessions, csrf }))
  api.use(usersRouter({ authorize, users }))
  api.use(studiesRouter({ authorize, studies }))
  api.use(membersRouter({ authorize, members }))
  api.use(invitationsRouter({ authorize, invitations, auth, csrf }))
  api.use(auditRouter({ authorize, audit }))
  api.use(recruitmentRouter({ authorize, settings: recruitmentSettings, questionnaires, summaries }))
  api.use(participantsRouter({ authorize, participants }))
  api.use(exportsRouter({ authorize, screeningLog }))
  api.use(consentFormsRouter({ authorize, forms: consentForms }))
  api.use(consentRouter({ authorize, consent, withdrawals, summaries: consentSummaries }))
  api.use(publicConsentRouter({ authorize, consent, withdrawals }))
  api.use(publicRouter({ authorize, dataSource, pool, participants, questionnaires, perHour: config.PUBLIC_ENQUIRIES_PER_HOUR }))
  if (deps.mailboxDir && config.NODE_ENV !== 'production') api.use(mailboxRouter({ authorize, directory: deps.mailboxDir }))
  api.use(apiNotFound)

  app.use('/api', api)

  const dist = path.resolve(config.CLIENT_DIST)
  if (existsSync(path.join(dist, 'index.html'))) {
    app.use(express.static(dist, { index: false, maxAge: '1h', setHeaders: immutableAssets }))
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache')
      res.sendFile(path.join(dist, 'index.html'))
    })
  }
  app.use(createErrorHandler(log, config.NODE_ENV === 'development'))
  return app
}

function immutableAssets(res: Response, filePath: string) {
  if (filePath.includes(`${path.sep}assets${path.sep}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable')
}
