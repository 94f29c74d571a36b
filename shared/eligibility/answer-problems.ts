import type { Answers, Question } from '../schemas/recruitment.js'
import { isCalendarDate } from './dates.js'

export interface AnswerProblem {
  /** `answers.<question id>` so forms can put the message on the field */
  path: string
  message: string
}

function isEmpty(value: unknown): boolean {
  // text of only spaces counts as no answer, as in the eligibility engine
  return value === undefined || value === null || (typeof value === 'string' && value.trim() === '') || (Array.isArray(value) && value.length === 0)
}

/**
 * What is wrong with a set of answers before anything is stored: unknown questions, missing required
 * answers, answers of the wrong kind, options not on the list, numbers out of range and dates in the
 * future. The public page refuses such answers with one message per field; staff screenings may keep
 * missing answers (the eligibility engine then asks a person to review).
 */
export function answerProblems(questions: readonly Question[], answers: Answers, today: string, { requireAll = true } = {}): AnswerProblem[] {
  const problems: AnswerProblem[] = []
  const byId = new Map(questions.map((q) => [q.id, q]))
  for (const id of Object.keys(answers)) {
    if (!byId.has(id)) problems.push({ path: `answers.${id}`, message: 'This question is not part of the questionnaire.' })
  }
  for (const q of questions) {
    const value = answers[q.id]
    const path = `answers.${q.id}`
    if (isEmpty(value)) {
      if (q.required && requireAll) problems.push({ path, message: 'Please answer this question.' })
      continue
    }
    const options = new Set(q.options.map((o) => o.value))
    switch (q.kind) {
      case 'yes_no':
        if (value !== 'yes' && value !== 'no') problems.push({ path, message: 'Choose yes or no.' })
        break
      case 'single_choice':
        if (typeof value !== 'string' || !options.has(value)) problems.push({ path, message: 'Choose one of the options.' })
        break
      case 'multiple_choice':
        if (!Array.isArray(value) || value.some((v) => !options.has(v))) problems.push({ path, message: 'Choose from the options listed.' })
        else if (new Set(value).size !== value.length) problems.push({ path, message: 'Each option can be chosen once.' })
        break
      case 'number':
        if (typeof value !== 'number' || !Number.isFinite(value)) problems.push({ path, message: 'Enter a number.' })
        else if (q.min !== null && value < q.min) problems.push({ path, message: `Enter a number of at least ${q.min}.` })
        else if (q.max !== null && value > q.max) problems.push({ path, message: `Enter a number of at most ${q.max}.` })
        break
      case 'date':
        if (typeof value !== 'string' || !isCalendarDate(value)) {
          problems.push({ path, message: 'Enter a date like 2025-03-31.' })
        } else if (value > today) problems.push({ path, message: 'This date is in the future. Check the year.' })
        break
      case 'free_text':
        if (typeof value !== 'string') problems.push({ path, message: 'Write your answer as text.' })
        break
    }
  }
  return problems
}
