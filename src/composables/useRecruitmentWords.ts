import type {
  CriterionFinding,
  Outcome,
  ParticipantStatus,
  Question,
  QuestionKind,
  QuestionRole,
  ReferralSource,
  Rule,
} from '@shared/schemas/recruitment'

/** Plain words for the recruitment codes: staff and partners never read a stored code. */
export const STATUS_WORDS: Record<ParticipantStatus, string> = {
  enquired: 'Enquired',
  screening: 'Awaiting review',
  eligible: 'Eligible',
  not_eligible: 'Not eligible',
  consented: 'Consented',
  withdrawn: 'Withdrawn',
}
export const STATUS_COLOURS: Record<ParticipantStatus, string> = {
  enquired: 'info',
  screening: 'warning',
  eligible: 'success',
  not_eligible: 'secondary',
  consented: 'primary',
  withdrawn: 'secondary',
}
export const OUTCOME_WORDS: Record<Outcome, string> = {
  eligible: 'Eligible',
  not_eligible: 'Not eligible',
  needs_review: 'Needs a person to review',
}
export const SOURCE_WORDS: Record<ReferralSource, string> = {
  public_page: 'Public study page',
  phone: 'Phone call',
  email: 'E-mail',
  clinic_referral: 'Clinic referral',
  community_group: 'Community group',
  word_of_mouth: 'Word of mouth',
  other: 'Other',
}
export const KIND_WORDS: Record<QuestionKind, string> = {
  yes_no: 'Yes or no',
  single_choice: 'One choice',
  multiple_choice: 'Several choices',
  number: 'Number',
  date: 'Date',
  free_text: 'Free text',
}
export const ROLE_WORDS: Record<QuestionRole, string> = {
  inclusion: 'Inclusion criterion',
  exclusion: 'Exclusion criterion',
  information: 'Information only',
}

export type Operator = Rule['operator']
/** The operators each kind of question offers (the comment on ruleSchema in shared/schemas/recruitment.ts). */
export const OPERATORS_BY_KIND: Record<QuestionKind, Operator[]> = {
  yes_no: ['is'],
  single_choice: ['is', 'is_not', 'is_one_of'],
  multiple_choice: ['includes_any', 'includes_all', 'includes_none'],
  number: ['gte', 'lte', 'gt', 'lt', 'eq', 'between'],
  date: ['on_or_after', 'on_or_before', 'within_last'],
  free_text: [],
}
export const OPERATOR_WORDS: Record<Operator, string> = {
  is: 'is',
  is_not: 'is not',
  is_one_of: 'is one of',
  includes_any: 'includes any of',
  includes_all: 'includes all of',
  includes_none: 'includes none of',
  gte: 'is at least',
  lte: 'is at most',
  gt: 'is more than',
  lt: 'is less than',
  eq: 'is exactly',
  between: 'is between',
  on_or_after: 'is on or after',
  on_or_before: 'is on or before',
  within_last: 'is within the last',
}

const NOT_ENROLLED_WORDS: Record<string, string> = {
  help_seeking: 'Looking for help with their own care',
  excluded: 'Met an exclusion criterion',
  exclusion_met: 'Met an exclusion criterion',
  inclusion_not_met: 'Did not meet an inclusion criterion',
  override: 'Outcome changed by the lead researcher',
  overridden: 'Outcome changed by the lead researcher',
}

/** A reason from the server: known codes in words, other codes with spaces, sentences as written. */
export function reasonInWords(reason: string): string {
  const known = NOT_ENROLLED_WORDS[reason]
  if (known) return known
  if (!/^[a-z_]+$/.test(reason)) return reason
  const spaced = reason.replace(/_/g, ' ').trim()
  return spaced.charAt(0).toUpperCase() + spaced.slice(1)
}

function optionLabel(question: Pick<Question, 'kind' | 'options'>, value: string): string {
  if (question.kind === 'yes_no') return value === 'yes' ? 'Yes' : value === 'no' ? 'No' : value
  return question.options.find((option) => option.value === value)?.label ?? value
}

/** "The answer is at least 18", for the question list and the read-only view. */
export function ruleInWords(question: Pick<Question, 'kind' | 'options' | 'rule'>): string {
  const rule = question.rule
  if (!rule) return 'No condition'
  const verb = OPERATOR_WORDS[rule.operator]
  const list = (values: string[]) => values.map((v) => optionLabel(question, v)).join(', ')
  switch (rule.operator) {
    case 'is':
    case 'is_not':
      return `The answer ${verb} “${optionLabel(question, rule.value)}”`
    case 'is_one_of':
    case 'includes_any':
    case 'includes_all':
    case 'includes_none':
      return `The answer ${verb}: ${list(rule.values)}`
    case 'between':
      return `The answer ${verb} ${rule.min} and ${rule.max}`
    case 'on_or_after':
    case 'on_or_before':
      return `The answer ${verb} ${rule.date}`
    case 'within_last':
      return `The answer ${verb} ${rule.amount} ${rule.unit}`
    default:
      return `The answer ${verb} ${rule.value}`
  }
}

/** One finding of a screening in plain words. */
export function findingInWords(finding: CriterionFinding): string {
  switch (finding.kind) {
    case 'inclusion_not_met':
      return 'Does not meet this inclusion criterion.'
    case 'exclusion_met':
      return finding.reason === 'help_seeking'
        ? 'Looking for help with their own care: thank them and share the resource list.'
        : 'Meets this exclusion criterion.'
    case 'needs_review':
      return finding.reason === 'free_text' ? 'A written answer for the team to read.' : 'Not answered: the team needs to ask.'
    case 'invalid':
      if (finding.reason === 'out_of_range') return 'The answer is outside the allowed range.'
      if (finding.reason === 'future_date') return 'The date given is in the future.'
      if (finding.reason === 'not_an_option') return 'The answer is not one of the options.'
      return 'The answer could not be read.'
  }
}

/** An answer as the person saw it: option labels, not stored values. */
export function answerInWords(question: Pick<Question, 'kind' | 'options'> | undefined, value: unknown): string {
  if (value === null || value === undefined || value === '' || (Array.isArray(value) && value.length === 0)) return 'Not answered'
  if (!question) return Array.isArray(value) ? value.join(', ') : String(value)
  if (Array.isArray(value)) return value.map((v) => optionLabel(question, String(v))).join(', ')
  if (question.kind === 'yes_no' || question.kind === 'single_choice') return optionLabel(question, String(value))
  return String(value)
}

/** A screening outcome in words, naming help-seeking plainly for the team. */
export function outcomeInWords(outcome: Outcome, helpSeeking: boolean): string {
  return helpSeeking ? `${OUTCOME_WORDS[outcome]}: looking for help with their own care` : OUTCOME_WORDS[outcome]
}
