import type { Answers, Question } from '@shared/schemas/recruitment'

export type AnswerValue = Answers[string]

/** Today as YYYY-MM-DD in the person's own time zone (a date answer may not be later). */
export function todayIso(now = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0')
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`
}

export function isEmptyAnswer(value: AnswerValue | undefined): boolean {
  return value === undefined || value === null || value === '' || (Array.isArray(value) && value.length === 0)
}

/**
 * What is wrong with one answer, in plain words, or null. Mirrors the schema and the eligibility
 * engine's own checks, so people hear about a slip before they send the form.
 */
export function answerProblem(question: Question, value: AnswerValue | undefined, today = todayIso()): string | null {
  if (isEmptyAnswer(value)) return question.required ? 'Please answer this question.' : null
  if (question.kind === 'number') {
    const number = typeof value === 'number' ? value : Number(value)
    if (!Number.isFinite(number)) return 'Please write a number.'
    if (question.min !== null && number < question.min) return `Please write a number from ${question.min}${question.max !== null ? ` to ${question.max}` : ' or more'}.`
    if (question.max !== null && number > question.max) return `Please write a number${question.min !== null ? ` from ${question.min}` : ''} up to ${question.max}.`
  }
  if (question.kind === 'date') {
    if (typeof value !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(value)) return 'Please choose a date.'
    if (value > today) return 'Please choose a date that is not in the future.'
  }
  if (question.kind === 'free_text' && typeof value === 'string' && value.length > 2000) return 'Please shorten your answer to 2000 characters or fewer.'
  return null
}

/** Only the answered questions are sent: an empty answer is "not answered", not an answer. */
export function answeredOnly(answers: Answers, questions: Question[]): Answers {
  const ids = new Set(questions.map((q) => q.id))
  return Object.fromEntries(Object.entries(answers).filter(([id, value]) => ids.has(id) && !isEmptyAnswer(value)))
}

/** A stable key from text: lower-case letters, digits and underscores, starting with a letter, unique among `taken`. */
export function keyFrom(text: string, taken: Iterable<string> = [], fallback = 'item'): string {
  let key = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .slice(0, 32)
    .replace(/_+$/, '')
  if (!key) key = fallback
  if (!/^[a-z]/.test(key)) key = `${fallback}_${key}`.slice(0, 32)
  const used = new Set(taken)
  let candidate = key
  for (let n = 2; used.has(candidate); n++) candidate = `${key}_${n}`
  return candidate
}
