/**
 * The one permission matrix of Heardwell: which study role (or the site administrator) may do what.
 * The server enforces it on every route (server/middleware/authorize.ts); the client reads it only
 * to hide what a person cannot open. tests/api/authorization-matrix.test.ts walks every registered
 * route as every role and checks the answer against this file.
 */
export const STUDY_ROLES = ['lead', 'coordinator', 'coder', 'partner'] as const
export type StudyRole = (typeof STUDY_ROLES)[number]

export const ROLE_LABELS: Record<StudyRole, string> = {
  lead: 'Lead researcher',
  coordinator: 'Coordinator',
  coder: 'Coder',
  partner: 'Patient partner',
}

interface Rule {
  /** study roles allowed */
  roles: readonly StudyRole[]
  /** whether the site administrator may do it without being a member of the study */
  siteAdmin: boolean
  /** what the action is, in plain words (shown in the matrix document and test failures) */
  description: string
}

const everyone = STUDY_ROLES
export const STUDY_ACTIONS = {
  'study.read': { roles: everyone, siteAdmin: true, description: 'see the study set-up and overview' },
  'study.update': { roles: ['lead'], siteAdmin: false, description: 'change the study set-up' },
  'study.assignLead': { roles: [], siteAdmin: true, description: 'name the lead researcher of a study' },
  'members.read': { roles: everyone, siteAdmin: true, description: 'see the study team' },
  'members.manage': { roles: ['lead'], siteAdmin: false, description: 'change roles and remove members' },
  'invitations.read': { roles: ['lead'], siteAdmin: false, description: 'see open invitations' },
  'invitations.manage': { roles: ['lead'], siteAdmin: false, description: 'invite people and revoke invitations' },
  'audit.read': { roles: ['lead'], siteAdmin: false, description: "read the study's audit trail" },
  'recruitment.settings': { roles: ['lead'], siteAdmin: false, description: 'change recruitment settings: sampling, resources, withdrawal rule, public page' },
  'screeningForm.read': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'see the screening questionnaire and its versions' },
  'screeningForm.manage': { roles: ['lead'], siteAdmin: false, description: 'write the screening questionnaire' },
  'participants.list': { roles: ['lead', 'coordinator', 'coder'], siteAdmin: false, description: 'list participants (coders see pseudonyms and characteristics only)' },
  'participants.read': { roles: ['lead', 'coordinator'], siteAdmin: false, description: "open a participant's record, contact details and screening" },
  'participants.screen': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'log enquiries and screen participants' },
  'participants.override': { roles: ['lead'], siteAdmin: false, description: 'override a screening outcome with a written reason' },
  'recruitment.summary': { roles: everyone, siteAdmin: false, description: 'see recruitment counts (no individual records)' },
  'exports.screeningLog': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'download the screening log (pseudonyms only)' },
  'exports.contacts': { roles: ['lead'], siteAdmin: false, description: 'add contact details to an export (audited)' },
  'consentForms.read': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'see consent form versions and download them' },
  'consentForms.manage': { roles: ['lead'], siteAdmin: false, description: 'add, edit and approve consent form versions' },
  'consent.read': { roles: ['lead', 'coordinator'], siteAdmin: false, description: "see a participant's consent records and withdrawal" },
  'consent.record': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'record written or verbal consent and send e-consent links' },
  'withdrawal.record': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'record a withdrawal and answer withdrawal requests' },
  'consent.summary': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'see the consent dashboard and the re-consent queue' },
  'interviews.read': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'see interviews, their times and field notes, and interview guides' },
  'interviews.manage': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'schedule, reschedule and close interviews' },
  'interviewGuides.manage': { roles: ['lead'], siteAdmin: false, description: 'add interview guide versions' },
  'transcripts.upload': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'upload transcripts and review their de-identification' },
  'transcripts.approve': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'approve a de-identified transcript' },
  'transcripts.read': { roles: ['lead', 'coordinator', 'coder'], siteAdmin: false, description: 'read approved, de-identified transcripts' },
  'codebook.read': { roles: ['lead', 'coder'], siteAdmin: false, description: 'see the codebook, its snapshots and download it' },
  'codebook.manage': { roles: ['lead', 'coder'], siteAdmin: false, description: 'add, edit, nest, merge, split, retire and import codes; save snapshots' },
  'coding.read': { roles: ['lead', 'coder'], siteAdmin: false, description: 'read coding (your own, others’ when the study allows it), search, and see the code matrices' },
  'coding.write': { roles: ['lead', 'coder'], siteAdmin: false, description: 'code transcripts: add, resize, recode and remove your own excerpts' },
  'coding.settings': { roles: ['lead'], siteAdmin: false, description: 'decide whether coders may see each other’s coding' },
  'memos.read': { roles: ['lead', 'coder'], siteAdmin: false, description: 'read and search memos' },
  'memos.write': { roles: ['lead', 'coder'], siteAdmin: false, description: 'write memos and change or remove your own' },
  'agreement.read': { roles: ['lead', 'coder'], siteAdmin: false, description: 'see inter-coder agreement and where coders differ (coders only when the study allows comparison)' },
  'saturation.read': { roles: ['lead', 'coder'], siteAdmin: false, description: 'see new codes per interview and the saturation assessment' },
  'analysis.settings': { roles: ['lead'], siteAdmin: false, description: 'switch agreement on or off for the study and choose its unit' },
  'themes.read': { roles: ['lead', 'coder'], siteAdmin: false, description: 'see the themes with their codes and supporting excerpts' },
  'themes.manage': { roles: ['lead'], siteAdmin: false, description: 'build themes, choose their supporting excerpts and which partners may see' },
  'reviewRounds.manage': { roles: ['lead'], siteAdmin: false, description: 'open and close review rounds with patient partners, read their answers and respond' },
  'review.answer': { roles: ['partner'], siteAdmin: false, description: 'read the themes of a review round in plain language and answer them' },
  'reports.read': { roles: ['lead', 'coordinator', 'coder'], siteAdmin: false, description: 'see the reports (characteristics with small cells suppressed, recruitment flow, quotes allowed by consent, checklists, methods summary) and download them as CSV' },
  'reports.manage': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'fill in the reporting checklists' },
  'anonymisationLog.read': { roles: ['lead', 'coordinator'], siteAdmin: false, description: 'read the anonymisation log (identifiable)' },
} as const satisfies Record<string, Rule>
export type StudyAction = keyof typeof STUDY_ACTIONS

/** Site-wide actions: only the site administrator. */
export const SITE_ACTIONS = {
  'users.manage': 'create, list and disable accounts',
  'studies.create': 'create a study',
  'audit.read': 'read the site-wide audit trail (sign-ins, accounts, studies created)',
} as const
export type SiteAction = keyof typeof SITE_ACTIONS

/**
 * What a route needs: `public` (anyone, signed in or not), `signedIn` (any account), a site action,
 * or a study action (then the route has a `:studyId` parameter).
 */
export type Access = 'public' | 'signedIn' | `site:${SiteAction}` | `study:${StudyAction}`

export interface Subject {
  signedIn: boolean
  siteAdmin: boolean
  /** the caller's role in the study the route is about, if any */
  role: StudyRole | null
}

export type Decision = 'allow' | 'unauthenticated' | 'forbidden'

export function decide(subject: Subject, access: Access): Decision {
  if (access === 'public') return 'allow'
  if (!subject.signedIn) return 'unauthenticated'
  if (access === 'signedIn') return 'allow'
  if (access.startsWith('site:')) return subject.siteAdmin ? 'allow' : 'forbidden'
  const rule: Rule = STUDY_ACTIONS[access.slice('study:'.length) as StudyAction]
  if (!rule) return 'forbidden'
  if (subject.role && rule.roles.includes(subject.role)) return 'allow'
  if (subject.siteAdmin && rule.siteAdmin) return 'allow'
  return 'forbidden'
}

export function can(role: StudyRole | null, siteAdmin: boolean, action: StudyAction): boolean {
  return decide({ signedIn: true, siteAdmin, role }, `study:${action}`) === 'allow'
}
