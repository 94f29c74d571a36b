/**
 * Screens one person's answers against a study's ethics-approved inclusion and exclusion criteria.
 * Pure: the screening date is passed in, so the same answers always give the same result. Anything
 * the rules cannot settle (no answer, an answer that does not fit, free text, a rule that cannot be
 * applied) goes to `review` for a person to decide; nothing unclear passes silently.
 */
import type { Answers, CriterionFinding, EligibilityResult, Question, QuestionnaireInput } from '../schemas/recruitment.js'
import { checkAnswer } from './answers.js'
import { isCalendarDate } from './dates.js'
import { checkRule } from './rules.js'
import { describeAnswer } from './wording.js'

const HELP_SEEKING_NOTE = ' The person may be looking for help: thank them and point them to care.'

function assess(question: Question, raw: Answers[string] | undefined, today: string): CriterionFinding | null {
  const finding = (kind: CriterionFinding['kind'], reason: CriterionFinding['reason'], detail: string): CriterionFinding => ({
    questionId: question.id,
    question: question.text,
    kind,
    reason,
    detail,
  })

  const checked = checkAnswer(question, raw, today)
  if (checked.status === 'missing') {
    return question.required ? finding('needs_review', 'missing', 'No answer was given to this required criterion; a person must ask or decide.') : null
  }
  if (checked.status === 'invalid') return finding('invalid', checked.reason, `${checked.detail} A person must check it.`)

  if (question.kind === 'free_text') {
    if (question.rule) {
      return finding('invalid', null, 'A free-text question cannot carry a rule, so a person must read the answer. The questionnaire needs correcting.')
    }
    return finding('needs_review', 'free_text', 'The answer is free text; a person must read it and decide.')
  }
  if (!question.rule) return finding('needs_review', null, 'This criterion has no rule, so a person must read the answer and decide.')

  const result = checkRule(question, question.rule, checked.value, today)
  if (!result.fits) return finding('invalid', null, result.problem)
  const answer = describeAnswer(question, checked.value)
  if (question.role === 'inclusion') {
    return result.satisfied ? null : finding('inclusion_not_met', null, `The answer is ${answer}; the study needs ${result.condition}.`)
  }
  if (!result.satisfied) return null
  const reason = question.exclusionReason
  const note = reason === 'help_seeking' ? HELP_SEEKING_NOTE : ''
  return finding('exclusion_met', reason, `The answer is ${answer}; the study excludes ${result.condition}.${note}`)
}

/**
 * @param today the screening date, YYYY-MM-DD; `within_last` periods count back from it and later
 *   answer dates are refused. A malformed date is a programming error and throws a RangeError.
 */
export function evaluateEligibility(
  questionnaire: Pick<QuestionnaireInput, 'questions'>,
  answers: Answers,
  today: string,
): EligibilityResult {
  if (!isCalendarDate(today)) throw new RangeError(`The screening date must be a calendar date (YYYY-MM-DD), not “${today}”.`)
  const failing: CriterionFinding[] = []
  const review: CriterionFinding[] = []
  for (const question of questionnaire.questions) {
    // Information-only questions never affect the outcome, whatever their answer.
    if (question.role === 'information') continue
    // Own keys only: an id such as 'constructor' must not pick up the object prototype's member.
    const found = assess(question, Object.hasOwn(answers, question.id) ? answers[question.id] : undefined, today)
    if (!found) continue
    if (found.kind === 'inclusion_not_met' || found.kind === 'exclusion_met') failing.push(found)
    else review.push(found)
  }
  // One unmet criterion settles it, even while others still need a person to look.
  const outcome = failing.length > 0 ? 'not_eligible' : review.length > 0 ? 'needs_review' : 'eligible'
  return { outcome, helpSeeking: failing.some((f) => f.reason === 'help_seeking'), failing, review }
}
