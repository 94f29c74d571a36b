import 'reflect-metadata'
import { randomUUID } from 'node:crypto'
import { existsSync } from 'node:fs'
import path from 'node:path'
import express, { type NextFunction, type Request, type Response } from 'express'
import { csrfSync } from 'csrf-sync'
import { AppError } from './lib/errors.js'
import { createAuthorize } from './middleware/authorize.js'
import { apiNotFound, createErrorHandler } from './middleware/errors.js'
import { noStore, sameOriginWrites, securityHeaders } from './middleware/security.js'
import { auditRouter } from './modules/audit/audit.router.js'
import { authRouter } from './modules/auth/auth.router.js'
import { configurePassport } from './modules/auth/passport.js'
import { createSessionMiddleware, enforceAbsoluteLimit } from './modules/auth/session.js'
import { healthRouter } from './modules/health/health.router.js'
import { mailboxRouter } from './modules/mail/mailbox.router.js'
import { invitationsRouter } from './modules/studies/invitations.router.js'
import { membersRouter } from './modules/studies/members.router.js'
import { studiesRouter } from './modules/studies/studies.router.js'
import { usersRouter } from './modules/users/users.router.js'
import { buildServices, type AppDeps } from './services.js'

export { poolOf, type AppDeps } from './services.js'
import { consentFormsRouter } from './modules/consent/consent-forms.router.js'
import { consentRouter } from './modules/consent/consent.router.js'
import { publicConsentRouter } from './modules/consent/public-consent.router.js'
import { exportsRouter } from './modules/recruitment/exports.router.js'
import { interviewsRouter } from './modules/interviews/interviews.router.js'
import { transcriptsRouter } from './modules/transcripts/transcripts.router.js'
import { codesRouter } from './modules/coding/codes.router.js'
import { analysisRouter } from './modules/analysis/analysis.router.js'
import { reportsRouter } from './modules/reports/reports.router.js'
import { reviewRoundsRouter } from './modules/themes/review-rounds.router.js'
import { themesRouter } from './modules/themes/themes.router.js'
import { codeMatricesRouter } from './modules/coding/code-matrices.router.js'
import { searchRouter } from './modules/coding/search.router.js'
import { excerptsRouter } from './modules/coding/excerpts.router.js'
import { memosRouter } from './modules/coding/memos.router.js'
import { participantsRouter } from './modules/recruitment/participants.router.js'
import { publicRouter } from './modules/recruitment/public.router.js'
import { recruitmentRouter } from './modules/recruitment/recruitment.router.js'

/** Builds the Express app (no listen: tests drive it with supertest). */
export function createApp(deps: AppDeps) {
  const { config, dataSource, storage, mailTransport, log } = deps
  const secure = config.PUBLIC_URL.startsWith('https:')

  const services = buildServices(deps)
  const { pool, publicUrl, audit, sessions, auth, invitations, studies, members, users, questionnaires, participants, recruitmentSettings, summaries, screeningLog, consentForms, consent, withdrawals, consentSummaries, interviews, guides, transcripts } = services
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
  api.use(interviewsRouter({ authorize, interviews, guides }))
  api.use(transcriptsRouter({ authorize, transcripts }))
  api.use(codesRouter({ authorize, codes: services.codes, structure: services.codeStructure, transfer: services.codebookTransfer }))
  api.use(excerptsRouter({ authorize, excerpts: services.excerpts }))
  api.use(memosRouter({ authorize, memos: services.memos }))
  api.use(searchRouter({ authorize, search: services.codingSearch, excerpts: services.excerpts }))
  api.use(codeMatricesRouter({ authorize, matrices: services.codeMatrices, excerpts: services.excerpts }))
  api.use(reportsRouter({ authorize, reports: services.reports, quotes: services.quoteExports, exports: services.reportExports, codebook: services.codebookTransfer }))
  api.use(themesRouter({ authorize, themes: services.themes }))
  api.use(reviewRoundsRouter({ authorize, rounds: services.reviewRounds, partner: services.partnerReview }))
  api.use(analysisRouter({ authorize, agreement: services.agreement, saturation: services.saturation, excerpts: services.excerpts }))
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
