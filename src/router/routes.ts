import type { RouteRecordRaw } from 'vue-router'
import type { StudyAction } from '@shared/permissions'

declare module 'vue-router' {
  interface RouteMeta {
    /** open without signing in */
    public?: true
    /** a page without the app shell (sign-in and the e-mailed links) */
    bare?: true
    /** the study action the route needs; the route then has a `:studyId` parameter */
    permission?: StudyAction
    /** only the site administrator */
    siteAdmin?: true
    /** the document title */
    title?: string
  }
}

/** Every view is loaded on first visit, so the first page carries only the shell. */
export const routes: RouteRecordRaw[] = [
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/auth/SignInView.vue'),
    meta: { public: true, bare: true, title: 'Sign in' },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/auth/ForgotPasswordView.vue'),
    meta: { public: true, bare: true, title: 'Forgotten password' },
  },
  {
    path: '/reset-password/:token',
    name: 'reset-password',
    component: () => import('@/views/auth/ResetPasswordView.vue'),
    meta: { public: true, bare: true, title: 'Choose a new password' },
  },
  {
    path: '/invitations/:token',
    name: 'accept-invitation',
    component: () => import('@/views/auth/AcceptInvitationView.vue'),
    meta: { public: true, bare: true, title: 'Join a study' },
  },
  { path: '/', name: 'my-studies', component: () => import('@/views/studies/MyStudiesView.vue'), meta: { title: 'My studies' } },
  {
    path: '/studies/:studyId',
    name: 'study-overview',
    component: () => import('@/views/studies/StudyOverviewView.vue'),
    meta: { permission: 'study.read', title: 'Study overview' },
  },
  {
    path: '/studies/:studyId/recruitment',
    name: 'study-recruitment',
    component: () => import('@/views/recruitment/RecruitmentView.vue'),
    meta: { permission: 'recruitment.summary', title: 'Recruitment' },
  },
  {
    path: '/studies/:studyId/recruitment/settings',
    name: 'study-recruitment-settings',
    component: () => import('@/views/recruitment/RecruitmentSettingsView.vue'),
    meta: { permission: 'recruitment.settings', title: 'Recruitment settings' },
  },
  {
    path: '/studies/:studyId/participants',
    name: 'study-participants',
    component: () => import('@/views/recruitment/ParticipantsView.vue'),
    meta: { permission: 'participants.list', title: 'Participants' },
  },
  {
    path: '/studies/:studyId/participants/:participantId',
    name: 'study-participant',
    component: () => import('@/views/recruitment/ParticipantView.vue'),
    meta: { permission: 'participants.read', title: 'Participant' },
  },
  {
    path: '/studies/:studyId/consent',
    name: 'study-consent',
    component: () => import('@/views/consent/ConsentView.vue'),
    meta: { permission: 'consent.summary', title: 'Consent' },
  },
  {
    path: '/studies/:studyId/consent-forms',
    name: 'study-consent-forms',
    component: () => import('@/views/consent/ConsentFormsView.vue'),
    meta: { permission: 'consentForms.read', title: 'Consent forms' },
  },
  {
    path: '/studies/:studyId/interviews',
    name: 'study-interviews',
    component: () => import('@/views/interviews/InterviewsView.vue'),
    meta: { permission: 'interviews.read', title: 'Interviews' },
  },
  {
    path: '/studies/:studyId/interview-guides',
    name: 'study-interview-guides',
    component: () => import('@/views/interviews/InterviewGuidesView.vue'),
    meta: { permission: 'interviews.read', title: 'Interview guides' },
  },
  {
    path: '/studies/:studyId/transcripts',
    name: 'study-transcripts',
    component: () => import('@/views/transcripts/TranscriptsView.vue'),
    meta: { permission: 'transcripts.read', title: 'Transcripts' },
  },
  {
    path: '/studies/:studyId/transcripts/:transcriptId',
    name: 'study-transcript',
    component: () => import('@/views/transcripts/TranscriptReadingView.vue'),
    meta: { permission: 'transcripts.read', title: 'Transcript' },
  },
  {
    path: '/studies/:studyId/transcripts/:transcriptId/review',
    name: 'study-transcript-review',
    component: () => import('@/views/transcripts/TranscriptReviewView.vue'),
    meta: { permission: 'transcripts.upload', title: 'De-identify a transcript' },
  },
  {
    path: '/studies/:studyId/transcripts/:transcriptId/coding',
    name: 'study-coding',
    component: () => import('@/views/coding/CodingView.vue'),
    meta: { permission: 'coding.read', title: 'Coding' },
  },
  {
    path: '/studies/:studyId/codebook',
    name: 'study-codebook',
    component: () => import('@/views/coding/CodebookView.vue'),
    meta: { permission: 'codebook.read', title: 'Codebook' },
  },
  {
    path: '/studies/:studyId/memos',
    name: 'study-memos',
    component: () => import('@/views/coding/MemosView.vue'),
    meta: { permission: 'memos.read', title: 'Memos' },
  },
  {
    path: '/studies/:studyId/search',
    name: 'study-search',
    component: () => import('@/views/coding/SearchView.vue'),
    meta: { permission: 'coding.read', title: 'Search' },
  },
  {
    path: '/studies/:studyId/matrices',
    name: 'study-matrices',
    component: () => import('@/views/coding/MatricesView.vue'),
    meta: { permission: 'coding.read', title: 'Code matrices' },
  },
  {
    path: '/studies/:studyId/agreement',
    name: 'study-agreement',
    component: () => import('@/views/analysis/AgreementView.vue'),
    meta: { permission: 'agreement.read', title: 'Inter-coder agreement' },
  },
  {
    path: '/studies/:studyId/saturation',
    name: 'study-saturation',
    component: () => import('@/views/analysis/SaturationView.vue'),
    meta: { permission: 'saturation.read', title: 'Saturation' },
  },
  {
    path: '/studies/:studyId/themes',
    name: 'study-themes',
    component: () => import('@/views/themes/ThemesView.vue'),
    meta: { permission: 'themes.read', title: 'Themes' },
  },
  {
    path: '/studies/:studyId/review-rounds',
    name: 'study-review-rounds',
    component: () => import('@/views/themes/ReviewRoundsView.vue'),
    meta: { permission: 'reviewRounds.manage', title: 'Partner review' },
  },
  {
    path: '/studies/:studyId/review-rounds/:roundId',
    name: 'study-review-round',
    component: () => import('@/views/themes/ReviewRoundView.vue'),
    meta: { permission: 'reviewRounds.manage', title: 'Review round' },
  },
  {
    path: '/studies/:studyId/review',
    name: 'study-partner-rounds',
    component: () => import('@/views/review/PartnerRoundsView.vue'),
    meta: { permission: 'review.answer', title: 'Themes to review' },
  },
  {
    path: '/studies/:studyId/review/:roundId',
    name: 'study-partner-round',
    component: () => import('@/views/review/PartnerRoundView.vue'),
    meta: { permission: 'review.answer', title: 'Review the themes' },
  },
  {
    path: '/studies/:studyId/reports',
    name: 'study-reports',
    component: () => import('@/views/reports/ReportsView.vue'),
    meta: { permission: 'reports.read', title: 'Reports' },
  },
  {
    path: '/studies/:studyId/anonymisation-log',
    name: 'study-anonymisation-log',
    component: () => import('@/views/transcripts/AnonymisationLogView.vue'),
    meta: { permission: 'anonymisationLog.read', title: 'Anonymisation log' },
  },
  {
    path: '/studies/:studyId/screening-form',
    name: 'study-screening-form',
    component: () => import('@/views/recruitment/ScreeningFormView.vue'),
    meta: { permission: 'screeningForm.read', title: 'Screening questions' },
  },
  {
    path: '/studies/:studyId/team',
    name: 'study-team',
    component: () => import('@/views/team/TeamView.vue'),
    meta: { permission: 'members.read', title: 'Team' },
  },
  {
    path: '/studies/:studyId/audit',
    name: 'study-audit',
    component: () => import('@/views/audit/AuditView.vue'),
    meta: { permission: 'audit.read', title: 'Audit trail' },
  },
  {
    path: '/join/:code',
    name: 'public-study',
    component: () => import('@/views/public/PublicStudyView.vue'),
    meta: { public: true, bare: true, title: 'Take part in a study' },
  },
  {
    path: '/consent/:token',
    name: 'public-consent',
    component: () => import('@/views/public/PublicConsentView.vue'),
    meta: { public: true, bare: true, title: 'Consent to take part' },
  },
  {
    path: '/withdraw/:token',
    name: 'public-withdrawal',
    component: () => import('@/views/public/PublicWithdrawalView.vue'),
    meta: { public: true, bare: true, title: 'Stop taking part' },
  },
  { path: '/account', name: 'account', component: () => import('@/views/account/AccountView.vue'), meta: { title: 'Your account' } },
  {
    path: '/admin',
    name: 'site-admin',
    component: () => import('@/views/admin/AdminView.vue'),
    meta: { siteAdmin: true, title: 'Site administration' },
  },
  {
    path: '/admin/audit',
    name: 'site-audit',
    component: () => import('@/views/audit/AuditView.vue'),
    meta: { siteAdmin: true, title: 'Site audit trail' },
  },
  {
    path: '/dev/mailbox',
    name: 'dev-mailbox',
    component: () => import('@/views/dev/DevMailboxView.vue'),
    meta: { public: true, bare: true, title: 'Development mailbox' },
  },
  {
    path: '/not-allowed',
    name: 'not-allowed',
    component: () => import('@/views/errors/NotAllowedView.vue'),
    meta: { title: 'Not open to you' },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/errors/NotFoundView.vue'),
    meta: { public: true, title: 'Page not found' },
  },
]
