/** Applies one structured rule (question, operator, value) to a checked answer. */
import type { Question, QuestionKind, Rule } from '../schemas/recruitment.js'
import type { ValidAnswer } from './answers.js'
import { describeDate, isCalendarDate, subtractPeriod } from './dates.js'
import { listOf, optionLabel } from './wording.js'

export type RuleCheck =
  /** `condition` completes "the study needs …" / "the study excludes …". */
  | { fits: true; satisfied: boolean; condition: string }
  /** The rule cannot be applied as written: the questionnaire needs correcting. */
  | { fits: false; problem: string }

const OPERATORS: Record<QuestionKind, readonly Rule['operator'][]> = {
  yes_no: ['is'],
  single_choice: ['is', 'is_not', 'is_one_of'],
  multiple_choice: ['includes_any', 'includes_all', 'includes_none'],
  number: ['gte', 'lte', 'gt', 'lt', 'eq', 'between'],
  date: ['on_or_after', 'on_or_before', 'within_last'],
  free_text: [],
}

const KIND_NAMES: Record<QuestionKind, string> = {
  yes_no: 'a yes/no',
  single_choice: 'a single-choice',
  multiple_choice: 'a multiple-choice',
  number: 'a number',
  date: 'a date',
  free_text: 'a free-text',
}

const misconfigured = (problem: string): RuleCheck => ({ fits: false, problem: `${problem} The questionnaire needs correcting.` })
const outcome = (satisfied: boolean, condition: string): RuleCheck => ({ fits: true, satisfied, condition })

/** A rule that names an option the question does not offer can never be met as intended. */
function unknownOption(question: Question, values: string[]): RuleCheck | null {
  const known = question.kind === 'yes_no' ? ['yes', 'no'] : question.options.map((o) => o.value)
  const unknown = values.filter((v) => !known.includes(v))
  return unknown.length === 0 ? null : misconfigured(`The rule names ${unknown.map((v) => `“${v}”`).join(', ')}, not among the question's options.`)
}

const labels = (question: Question, values: string[], conjunction: 'or' | 'and') =>
  listOf(values.map((v) => optionLabel(question, v)), conjunction)

export function checkRule(question: Question, rule: Rule, answer: ValidAnswer, today: string): RuleCheck {
  if (!OPERATORS[question.kind].includes(rule.operator)) {
    return misconfigured(`The rule uses “${rule.operator}”, which does not apply to ${KIND_NAMES[question.kind]} question.`)
  }
  const text = typeof answer === 'string' ? answer : ''
  const chosen = Array.isArray(answer) ? answer : []
  const n = typeof answer === 'number' ? answer : Number.NaN
  switch (rule.operator) {
    case 'is':
      return unknownOption(question, [rule.value]) ?? outcome(text === rule.value, optionLabel(question, rule.value))
    case 'is_not':
      return unknownOption(question, [rule.value]) ?? outcome(text !== rule.value, `any answer except ${optionLabel(question, rule.value)}`)
    case 'is_one_of':
      return unknownOption(question, rule.values) ?? outcome(rule.values.includes(text), `one of ${labels(question, rule.values, 'or')}`)
    case 'includes_any':
      return unknownOption(question, rule.values) ?? outcome(rule.values.some((v) => chosen.includes(v)), `at least one of ${labels(question, rule.values, 'or')}`)
    case 'includes_all':
      return unknownOption(question, rule.values) ?? outcome(rule.values.every((v) => chosen.includes(v)), `all of ${labels(question, rule.values, 'and')}`)
    case 'includes_none':
      return unknownOption(question, rule.values) ?? outcome(!rule.values.some((v) => chosen.includes(v)), `none of ${labels(question, rule.values, 'or')}`)
    case 'gte':
      return outcome(n >= rule.value, `${rule.value} or more`)
    case 'lte':
      return outcome(n <= rule.value, `${rule.value} or less`)
    case 'gt':
      return outcome(n > rule.value, `more than ${rule.value}`)
    case 'lt':
      return outcome(n < rule.value, `less than ${rule.value}`)
    case 'eq':
      return outcome(n === rule.value, `exactly ${rule.value}`)
    case 'between':
      if (rule.min > rule.max) return misconfigured(`The rule's range runs backwards (${rule.min} to ${rule.max}).`)
      return outcome(n >= rule.min && n <= rule.max, `${rule.min} to ${rule.max} (both included)`)
    case 'on_or_after':
    case 'on_or_before': {
      if (!isCalendarDate(rule.date)) return misconfigured(`The rule's date “${rule.date}” is not a calendar date.`)
      const after = rule.operator === 'on_or_after'
      // ISO dates of four-digit years compare correctly as strings.
      return outcome(after ? text >= rule.date : text <= rule.date, `a date on or ${after ? 'after' : 'before'} ${describeDate(rule.date)}`)
    }
    case 'within_last': {
      if (!Number.isInteger(rule.amount) || rule.amount < 1) return misconfigured(`The rule's period (${rule.amount} ${rule.unit}) is not a whole number of at least 1.`)
      const from = subtractPeriod(today, rule.amount, rule.unit)
      const unit = rule.amount === 1 ? rule.unit.slice(0, -1) : rule.unit
      return outcome(
        text >= from && text <= today,
        `a date within the last ${rule.amount} ${unit} (${describeDate(from)} to ${describeDate(today)})`,
      )
    }
  }
}
