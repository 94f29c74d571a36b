import type { DataSource } from 'typeorm'
import type { Pool } from 'pg'
import type PgBoss from 'pg-boss'
import type { Transporter } from 'nodemailer'
import type { Config } from './config.js'
import type { Logger } from './lib/logger.js'
import type { ObjectStore } from './storage/object-store.js'
import { AuditService } from './modules/audit/audit.service.js'
import { AuthService } from './modules/auth/auth.service.js'
import { SessionRevoker } from './modules/auth/session-store.js'
import { SignInThrottle } from './modules/auth/sign-in-throttle.js'
import { ConsentFormService } from './modules/consent/consent-form.service.js'
import { ConsentSummaryService } from './modules/consent/consent-summary.service.js'
import { ConsentService } from './modules/consent/consent.service.js'
import { WithdrawalService } from './modules/consent/withdrawal.service.js'
import { InterviewGuideService } from './modules/interviews/interview-guide.service.js'
import { InterviewService } from './modules/interviews/interview.service.js'
import { MailService } from './modules/mail/mail.service.js'
import { ParticipantService } from './modules/recruitment/participant.service.js'
import { QuestionnaireService } from './modules/recruitment/questionnaire.service.js'
import { RecruitmentSettingsService } from './modules/recruitment/recruitment-settings.service.js'
import { RecruitmentSummaryService } from './modules/recruitment/recruitment-summary.service.js'
import { ScreeningLogService } from './modules/recruitment/screening-log.service.js'
import { InvitationService } from './modules/studies/invitation.service.js'
import { MemberService } from './modules/studies/member.service.js'
import { StudyService } from './modules/studies/study.service.js'
import { UserService } from './modules/users/user.service.js'
import { TranscriptService } from './modules/transcripts/transcript.service.js'
import { CodeMatrixService } from './modules/coding/code-matrix.service.js'
import { CodeStructureService } from './modules/coding/code-structure.service.js'
import { CodeService } from './modules/coding/code.service.js'
import { CodebookTransferService } from './modules/coding/codebook-transfer.service.js'
import { CodingScope } from './modules/coding/coding-scope.js'
import { CodingSearchService } from './modules/coding/coding-search.service.js'
import { ExcerptService } from './modules/coding/excerpt.service.js'
import { MemoService } from './modules/coding/memo.service.js'
import { AgreementService } from './modules/analysis/agreement.service.js'
import { QuoteExportService } from './modules/reports/quote-export.service.js'
import { ReportExportsService } from './modules/reports/report-exports.service.js'
import { ReportsService } from './modules/reports/reports.service.js'
import { PartnerReviewService } from './modules/themes/partner-review.service.js'
import { ReviewRoundService } from './modules/themes/review-round.service.js'
import { ThemeService } from './modules/themes/theme.service.js'
import { SaturationService } from './modules/analysis/saturation.service.js'

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

/** Every domain service, wired once; the HTTP app and the background workers share this. */
export function buildServices(deps: AppDeps) {
  const { config, dataSource, storage, boss, log } = deps
  const pool = poolOf(dataSource)
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
  const interviews = new InterviewService(dataSource, boss, audit, mail, consent)
  const guides = new InterviewGuideService(dataSource, storage, audit)
  const transcripts = new TranscriptService(dataSource, storage, audit, consent)
  const codingScope = new CodingScope(consent)
  const codes = new CodeService(dataSource, audit, codingScope)
  const codeStructure = new CodeStructureService(dataSource, audit, codes)
  const codebookTransfer = new CodebookTransferService(dataSource, audit)
  const excerpts = new ExcerptService(dataSource, transcripts, codingScope, audit)
  const memos = new MemoService(dataSource, codingScope)
  const codingSearch = new CodingSearchService(dataSource, codingScope)
  const codeMatrices = new CodeMatrixService(dataSource, codingScope)
  const agreement = new AgreementService(dataSource, transcripts, codingScope, audit)
  const saturation = new SaturationService(dataSource, codingScope)
  const themes = new ThemeService(dataSource, audit, codingScope)
  const reviewRounds = new ReviewRoundService(dataSource, audit, mail, boss, publicUrl)
  const partnerReview = new PartnerReviewService(dataSource, consent)
  const reports = new ReportsService(dataSource, agreement, saturation)
  const quoteExports = new QuoteExportService(dataSource, consent)
  const reportExports = new ReportExportsService(dataSource, reports, audit)
  return { reports, quoteExports, reportExports, themes, reviewRounds, partnerReview, agreement, saturation, codingScope, codes, codeStructure, codebookTransfer, excerpts, memos, codingSearch, codeMatrices, transcripts, pool, publicUrl, audit, mail, sessions, throttle, auth, invitations, studies, members, users, questionnaires, participants, recruitmentSettings, summaries, screeningLog, consentForms, consent, withdrawals, consentSummaries, interviews, guides }
}
export type Services = ReturnType<typeof buildServices>
