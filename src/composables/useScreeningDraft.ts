import type { Question, QuestionKind, QuestionnaireInput, Rule } from '@shared/schemas/recruitment'
import { keyFrom } from './useScreeningAnswers'

/**
 * A question while the lead writes it. `uid` keys it on screen; `fresh` means it has never been
 * saved, so its id still follows its text. Once saved the id stays: answers are stored by it.
 */
export type DraftQuestion = Question & { uid: string; fresh: boolean }
export interface ScreeningDraft {
  intro: string
  questions: DraftQuestion[]
}

let counter = 0
const nextUid = () => `q${++counter}`

export function toDraft(questionnaire: Pick<QuestionnaireInput, 'intro' | 'questions'> | null): ScreeningDraft {
  return {
    intro: questionnaire?.intro ?? '',
    questions: (questionnaire?.questions ?? []).map((q) => ({ ...structuredClone(q), uid: nextUid(), fresh: false })),
  }
}

export function fromDraft(draft: ScreeningDraft): QuestionnaireInput {
  return {
    intro: draft.intro,
    questions: draft.questions.map(({ uid: _uid, fresh: _fresh, ...question }) => question),
  }
}

export function newQuestion(taken: string[]): DraftQuestion {
  return {
    uid: nextUid(),
    fresh: true,
    id: keyFrom('', taken, 'question'),
    text: '',
    help: '',
    kind: 'yes_no',
    required: true,
    options: [],
    min: null,
    max: null,
    role: 'inclusion',
    rule: null,
    exclusionReason: 'excluded',
    characteristic: null,
  }
}

export const isChoiceKind = (kind: QuestionKind) => kind === 'single_choice' || kind === 'multiple_choice'

/** A rule of the chosen operator with a starting value of the right shape. */
export function startingRule(operator: Rule['operator'], kind: QuestionKind, firstOption: string | undefined, today: string): Rule {
  switch (operator) {
    case 'is':
    case 'is_not':
      return { operator, value: kind === 'yes_no' ? 'yes' : (firstOption ?? '') }
    case 'is_one_of':
    case 'includes_any':
    case 'includes_all':
    case 'includes_none':
      return { operator, values: firstOption ? [firstOption] : [] }
    case 'between':
      return { operator, min: 0, max: 100 }
    case 'on_or_after':
    case 'on_or_before':
      return { operator, date: today }
    case 'within_last':
      return { operator, amount: 12, unit: 'months' }
    default:
      return { operator, value: 0 }
  }
}
