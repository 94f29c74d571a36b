/** Checks one answer against its question before any rule is applied. */
import type { Answers, Question } from '../schemas/recruitment.js'
import { describeDate, isCalendarDate } from './dates.js'

export type ValidAnswer = string | number | string[]

export type AnswerCheck =
  | { status: 'missing' }
  | { status: 'invalid'; reason: 'not_an_option' | 'out_of_range' | 'future_date'; detail: string }
  | { status: 'valid'; value: ValidAnswer }

type Raw = Answers[string] | undefined

/** Blank text counts as no answer, as an empty form field does (common practice). */
function isMissing(raw: Raw): raw is null | undefined | '' | [] {
  if (raw === undefined || raw === null) return true
  if (typeof raw === 'string') return raw.trim() === ''
  return Array.isArray(raw) && raw.length === 0
}

function notAnOption(detail: string): AnswerCheck {
  return { status: 'invalid', reason: 'not_an_option', detail }
}

function optionValues(question: Question): string[] {
  return question.kind === 'yes_no' ? ['yes', 'no'] : question.options.map((o) => o.value)
}

export function checkAnswer(question: Question, raw: Raw, today: string): AnswerCheck {
  if (isMissing(raw)) return { status: 'missing' }
  switch (question.kind) {
    case 'yes_no':
    case 'single_choice': {
      if (typeof raw !== 'string') return notAnOption('The answer should be a single choice from the list.')
      if (!optionValues(question).includes(raw)) return notAnOption(`The answer “${raw}” is not one of the options.`)
      return { status: 'valid', value: raw }
    }
    case 'multiple_choice': {
      if (!Array.isArray(raw)) return notAnOption('The answer should be one or more choices from the list.')
      const unknown = raw.filter((v) => !optionValues(question).includes(v))
      if (unknown.length > 0) return notAnOption(`The answer includes ${unknown.map((v) => `“${v}”`).join(', ')}, not among the options.`)
      return { status: 'valid', value: raw }
    }
    case 'number': {
      if (typeof raw !== 'number' || !Number.isFinite(raw)) return notAnOption('The answer should be a number.')
      const { min, max } = question
      if ((min !== null && raw < min) || (max !== null && raw > max)) {
        const range = min !== null && max !== null ? `${min} to ${max}` : min !== null ? `${min} or more` : `${max} or less`
        return { status: 'invalid', reason: 'out_of_range', detail: `The answer ${raw} is outside the allowed range (${range}).` }
      }
      return { status: 'valid', value: raw }
    }
    case 'date': {
      if (typeof raw !== 'string' || !isCalendarDate(raw)) return notAnOption('The answer should be a calendar date (YYYY-MM-DD).')
      // ISO dates of four-digit years compare correctly as strings.
      if (raw > today) {
        return { status: 'invalid', reason: 'future_date', detail: `The date ${describeDate(raw)} is after the screening date, ${describeDate(today)}.` }
      }
      return { status: 'valid', value: raw }
    }
    case 'free_text':
      if (typeof raw !== 'string') return notAnOption('The answer should be text.')
      return { status: 'valid', value: raw }
  }
}
