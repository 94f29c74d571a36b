/** Plain-English wording of answers and rule values for the coordinator's review screen. */
import type { Question } from '../schemas/recruitment.js'
import { describeDate } from './dates.js'

const YES_NO_LABELS: Record<string, string> = { yes: 'Yes', no: 'No' }

/** The label a person saw for an option value, in quotes. */
export function optionLabel(question: Question, value: string): string {
  const label = question.kind === 'yes_no' ? YES_NO_LABELS[value] : question.options.find((o) => o.value === value)?.label
  return `“${label ?? value}”`
}

/** 'A', 'A or B', 'A, B or C' (conjunction 'or' / 'and'). */
export function listOf(items: string[], conjunction: 'or' | 'and'): string {
  if (items.length <= 1) return items.join('')
  return `${items.slice(0, -1).join(', ')} ${conjunction} ${items[items.length - 1]}`
}

export function describeAnswer(question: Question, answer: string | number | string[]): string {
  if (Array.isArray(answer)) return listOf(answer.map((v) => optionLabel(question, v)), 'and')
  if (typeof answer === 'number') return String(answer)
  if (question.kind === 'date') return describeDate(answer)
  return optionLabel(question, answer)
}
