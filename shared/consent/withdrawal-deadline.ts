import { describeDate, parseCalendarDate } from '../eligibility/dates.js'
import type { WithdrawalRule } from '../schemas/recruitment.js'

/** All dates are calendar dates 'YYYY-MM-DD' in the study's own reckoning; no clock, no time zone. */
export interface WithdrawalDates {
  /** the day the participant asked */
  requestedOn: string
  /** the day of the participant's (last) interview, or null before any interview */
  interviewDate: string | null
  /** the day the team started analysing, or null while it has not */
  analysisStartedOn: string | null
}

/** Days since 1 January 1970, so dates compare and add as whole numbers. */
function dayNumber(date: string): number {
  const parsed = parseCalendarDate(date)
  if (!parsed) throw new RangeError(`Not a calendar date: ${date}`)
  const d = new Date(0)
  // setUTCFullYear, unlike Date.UTC, does not map years 0..99 onto 1900..1999.
  d.setUTCFullYear(parsed.year, parsed.month - 1, parsed.day)
  return Math.round(d.getTime() / 86_400_000)
}

/**
 * Whether a request to withdraw data made on `requestedOn` falls inside the study's deadline. Each
 * deadline day counts in full: "30 days after the interview" still allows day 30, and "until a
 * date" allows that date. Analysis starting is different: once it has started, that same day is
 * too late, because the data may already be merged into the coding.
 */
export function withinWithdrawalDeadline(rule: WithdrawalRule, dates: WithdrawalDates): boolean {
  const requested = dayNumber(dates.requestedOn)
  switch (rule.kind) {
    case 'any_time':
      return true
    case 'days_after_interview':
      return dates.interviewDate === null || requested <= dayNumber(dates.interviewDate) + rule.days
    case 'until_date':
      return requested <= dayNumber(rule.date)
    case 'until_analysis_starts':
      return dates.analysisStartedOn === null || requested < dayNumber(dates.analysisStartedOn)
  }
}

/** The rule in plain words for participants (kept at grade 8 or below; a unit test checks). */
export function describeWithdrawalRule(rule: WithdrawalRule): string {
  const start = 'You can ask for your data to be removed'
  switch (rule.kind) {
    case 'any_time':
      return `${start} at any time.`
    case 'days_after_interview':
      return `${start} up to ${rule.days} ${rule.days === 1 ? 'day' : 'days'} after your interview.`
    case 'until_date':
      return `${start} up to and including ${describeDate(rule.date)}.`
    case 'until_analysis_starts':
      return `${start} until we start to study what people told us. After that, we may not be able to take it out.`
  }
}
