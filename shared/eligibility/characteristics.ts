/** Fills in a person's purposive-sampling characteristics from their screening answers. */
import type { Answers, QuestionnaireInput } from '../schemas/recruitment.js'

/** characteristic key → chosen option value, for single-choice questions answered with one of their options. */
export function characteristicsFrom(questionnaire: Pick<QuestionnaireInput, 'questions'>, answers: Answers): Record<string, string> {
  const found: Record<string, string> = {}
  for (const question of questionnaire.questions) {
    if (question.kind !== 'single_choice' || question.characteristic === null) continue
    const answer = Object.hasOwn(answers, question.id) ? answers[question.id] : undefined
    if (typeof answer === 'string' && question.options.some((o) => o.value === answer)) found[question.characteristic] = answer
  }
  return found
}
