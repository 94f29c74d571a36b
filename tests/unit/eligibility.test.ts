import { z } from 'zod'
import { describe, expect, it } from 'vitest'
import { characteristicsFrom, evaluateEligibility } from '../../shared/eligibility/index.js'
import { questionSchema, type Answers, type CriterionFinding, type EligibilityResult, type Outcome } from '../../shared/schemas/recruitment.js'

const TODAY = '2025-06-15'
type QuestionIn = Omit<z.input<typeof questionSchema>, 'id' | 'text' | 'role'> & { role?: 'inclusion' | 'exclusion' | 'information' }
/** Parsed through the shared contract, so every fixture is a question the API would accept. */
const question = (id: string, q: QuestionIn) => questionSchema.parse({ id, text: `Question ${id}?`, role: 'inclusion', ...q })
const opts = (...values: string[]) => values.map((value) => ({ value, label: value.replace(/_/g, ' ') }))

const age = question('age', { kind: 'number', min: 0, max: 120, rule: { operator: 'gte', value: 18 } })
const ageBand = question('age_band', { kind: 'number', rule: { operator: 'between', min: 18, max: 65 } })
const diagnosedSince = question('diagnosed', { kind: 'date', rule: { operator: 'on_or_after', date: '2020-01-01' } })
const surgeryBy = question('surgery', { kind: 'date', rule: { operator: 'on_or_before', date: '2024-12-31' } })
const within = (amount: number, unit: 'days' | 'months' | 'years') => question('recent', { kind: 'date', rule: { operator: 'within_last', amount, unit } })
const services = (operator: 'includes_any' | 'includes_all' | 'includes_none', values: string[]) =>
  question('services', { kind: 'multiple_choice', options: opts('gp', 'hospital', 'community', 'online'), rule: { operator, values } })
const consent = question('consent', { kind: 'yes_no', rule: { operator: 'is', value: 'yes' } })
const contactReason = question('contact_reason', {
  kind: 'single_choice',
  role: 'exclusion',
  options: opts('take_part', 'help_for_myself', 'help_for_someone'),
  rule: { operator: 'is', value: 'help_for_myself' },
  exclusionReason: 'help_seeking',
})
const otherStudy = question('other_study', { kind: 'single_choice', role: 'exclusion', options: opts('none', 'drug_trial', 'interview'), rule: { operator: 'is_one_of', values: ['drug_trial', 'interview'] } })
const caringFor = question('caring_for', { kind: 'single_choice', options: opts('self', 'parent', 'child'), rule: { operator: 'is_not', value: 'self' } })
const story = question('story', { kind: 'free_text' })

type Row = [name: string, q: ReturnType<typeof question>, answer: Answers[string] | undefined, today: string, outcome: Outcome, failing: string[], review: string[]]
/** kind:reason pairs, in questionnaire order, so a wrong kind or reason fails the test. */
const pairs = (findings: CriterionFinding[]) => findings.map((f) => `${f.kind}:${f.reason}`)

// Expected values follow the rules of this specification (common practice for screening logic), not a published table.
const table: Row[] = [
  ['age 17 with gte 18 is not eligible', age, 17, TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['age 18 with gte 18 is eligible', age, 18, TODAY, 'eligible', [], []],
  ['between includes its lower end', ageBand, 18, TODAY, 'eligible', [], []],
  ['between includes its upper end', ageBand, 65, TODAY, 'eligible', [], []],
  ['between excludes just below', ageBand, 17.5, TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['between excludes just above', ageBand, 66, TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['on_or_after accepts the boundary day', diagnosedSince, '2020-01-01', TODAY, 'eligible', [], []],
  ['on_or_after refuses the day before', diagnosedSince, '2019-12-31', TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['on_or_before accepts the boundary day', surgeryBy, '2024-12-31', TODAY, 'eligible', [], []],
  ['on_or_before refuses the day after', surgeryBy, '2025-01-01', TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['within_last 5 years accepts the exact boundary day', within(5, 'years'), '2020-06-15', TODAY, 'eligible', [], []],
  ['within_last 5 years refuses the day before the boundary', within(5, 'years'), '2020-06-14', TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['within_last accepts the screening date itself', within(5, 'years'), TODAY, TODAY, 'eligible', [], []],
  ['within_last 1 year from 29 Feb 2024 starts on 28 Feb 2023', within(1, 'years'), '2023-02-28', '2024-02-29', 'eligible', [], []],
  ['within_last 1 year from 29 Feb 2024 refuses 27 Feb 2023', within(1, 'years'), '2023-02-27', '2024-02-29', 'not_eligible', ['inclusion_not_met:null'], []],
  ['within_last 1 month from 31 March clamps to 28 February', within(1, 'months'), '2025-02-28', '2025-03-31', 'eligible', [], []],
  ['within_last 1 month from 31 March refuses 27 February', within(1, 'months'), '2025-02-27', '2025-03-31', 'not_eligible', ['inclusion_not_met:null'], []],
  ['within_last 30 days crosses a month end', within(30, 'days'), '2025-01-30', '2025-03-01', 'eligible', [], []],
  ['within_last 30 days refuses day 31', within(30, 'days'), '2025-01-29', '2025-03-01', 'not_eligible', ['inclusion_not_met:null'], []],
  ['a date after the screening date goes to review', diagnosedSince, '2025-06-16', TODAY, 'needs_review', [], ['invalid:future_date']],
  ['an impossible date goes to review', diagnosedSince, '2025-02-30', TODAY, 'needs_review', [], ['invalid:not_an_option']],
  ['includes_any with one shared value is met', services('includes_any', ['hospital', 'community']), ['gp', 'community'], TODAY, 'eligible', [], []],
  ['includes_any with no shared value is not met', services('includes_any', ['hospital', 'community']), ['gp', 'online'], TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['includes_all missing one value is not met', services('includes_all', ['gp', 'hospital']), ['gp'], TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['includes_all with every value (and more) is met', services('includes_all', ['gp', 'hospital']), ['online', 'hospital', 'gp'], TODAY, 'eligible', [], []],
  ['includes_none with an overlap is not met', services('includes_none', ['online']), ['gp', 'online'], TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['includes_none without overlap is met', services('includes_none', ['online']), ['gp'], TODAY, 'eligible', [], []],
  ['yes/no inclusion answered no is not met', consent, 'no', TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['yes/no inclusion answered yes is met', consent, 'yes', TODAY, 'eligible', [], []],
  ['help-seeking exclusion is met', contactReason, 'help_for_myself', TODAY, 'not_eligible', ['exclusion_met:help_seeking'], []],
  ['help-seeking exclusion not met is eligible', contactReason, 'take_part', TODAY, 'eligible', [], []],
  ['exclusion is_one_of records reason excluded', otherStudy, 'interview', TODAY, 'not_eligible', ['exclusion_met:excluded'], []],
  ['exclusion is_one_of not matched is eligible', otherStudy, 'none', TODAY, 'eligible', [], []],
  ['is_not refuses the named value', caringFor, 'self', TODAY, 'not_eligible', ['inclusion_not_met:null'], []],
  ['is_not accepts another value', caringFor, 'parent', TODAY, 'eligible', [], []],
  ['a missing required answer needs review', age, undefined, TODAY, 'needs_review', [], ['needs_review:missing']],
  ['a null answer is missing', age, null, TODAY, 'needs_review', [], ['needs_review:missing']],
  ['a blank answer is missing', consent, '  ', TODAY, 'needs_review', [], ['needs_review:missing']],
  ['an empty choice list is missing', services('includes_any', ['gp']), [], TODAY, 'needs_review', [], ['needs_review:missing']],
  ['a missing optional answer is not assessed', { ...age, required: false }, undefined, TODAY, 'eligible', [], []],
  ['free text on an inclusion needs review', story, 'I look after my mother.', TODAY, 'needs_review', [], ['needs_review:free_text']],
  ['an option value not in the list goes to review', contactReason, 'something_else', TODAY, 'needs_review', [], ['invalid:not_an_option']],
  ['a yes/no answer other than yes or no goes to review', consent, 'maybe', TODAY, 'needs_review', [], ['invalid:not_an_option']],
  ['a number given as text goes to review', age, '17', TODAY, 'needs_review', [], ['invalid:not_an_option']],
  ['a number outside the question range goes to review', age, 130, TODAY, 'needs_review', [], ['invalid:out_of_range']],
  ['a criterion with no rule needs review', { ...age, rule: null }, 40, TODAY, 'needs_review', [], ['needs_review:null']],
  ['an operator that does not fit the kind goes to review', { ...consent, rule: { operator: 'gte', value: 1 } }, 'yes', TODAY, 'needs_review', [], ['invalid:null']],
  ['a rule naming an unknown option goes to review', { ...caringFor, rule: { operator: 'is', value: 'sibling' } }, 'parent', TODAY, 'needs_review', [], ['invalid:null']],
  ['a reversed between range goes to review', { ...ageBand, rule: { operator: 'between', min: 65, max: 18 } }, 40, TODAY, 'needs_review', [], ['invalid:null']],
  ['a free-text question carrying a rule goes to review', { ...story, rule: { operator: 'is', value: 'x' } }, 'text', TODAY, 'needs_review', [], ['invalid:null']],
]

describe('evaluateEligibility decision table', () => {
  it.each(table)('%s', (_name, q, answer, today, outcome, failing, review) => {
    const answers: Answers = answer === undefined ? {} : { [q.id]: answer }
    const result = evaluateEligibility({ questions: [q] }, answers, today)
    expect({ outcome: result.outcome, failing: pairs(result.failing), review: pairs(result.review) }).toEqual({ outcome, failing, review })
    expect(result.helpSeeking).toBe(failing.includes('exclusion_met:help_seeking'))
  })
})

describe('evaluateEligibility findings', () => {
  it('explains an unmet age criterion in plain English', () => {
    expect(evaluateEligibility({ questions: [age] }, { age: 17 }, TODAY)).toEqual<EligibilityResult>({
      outcome: 'not_eligible',
      helpSeeking: false,
      failing: [{ questionId: 'age', question: 'Question age?', kind: 'inclusion_not_met', reason: null, detail: 'The answer is 17; the study needs 18 or more.' }],
      review: [],
    })
  })

  it('states the within_last window with its calendar dates', () => {
    const [finding] = evaluateEligibility({ questions: [within(1, 'years')] }, { recent: '2023-02-27' }, '2024-02-29').failing
    expect(finding.detail).toBe('The answer is 27 February 2023; the study needs a date within the last 1 year (28 February 2023 to 29 February 2024).')
  })

  it('marks a help-seeking exclusion so the person is pointed to care', () => {
    const result = evaluateEligibility({ questions: [contactReason] }, { contact_reason: 'help_for_myself' }, TODAY)
    expect(result).toMatchObject({ outcome: 'not_eligible', helpSeeking: true })
    expect(result.failing[0].detail).toBe('The answer is “help for myself”; the study excludes “help for myself”. The person may be looking for help: thank them and point them to care.')
  })

  it('is not eligible when one criterion fails while another answer is missing, and lists both in order', () => {
    const result = evaluateEligibility({ questions: [consent, age, story] }, { age: 17 }, TODAY)
    expect(result.outcome).toBe('not_eligible')
    expect(result.failing.map((f) => f.questionId)).toEqual(['age'])
    expect(result.review.map((f) => `${f.questionId}:${f.reason}`)).toEqual(['consent:missing', 'story:missing'])
  })

  it('names the misconfiguration instead of throwing', () => {
    const misfit = { ...age, rule: { operator: 'includes_any' as const, values: ['gp'] } }
    const run = () => evaluateEligibility({ questions: [misfit] }, { age: 40 }, TODAY)
    expect(run).not.toThrow()
    expect(run().review[0]).toMatchObject({ kind: 'invalid', reason: null, detail: expect.stringMatching(/“includes_any”, which does not apply to a number question/) })
  })

  it.each([17, 18, 40])('never lets information-only questions change the outcome (age %i)', (years) => {
    const info = [
      question('region', { kind: 'single_choice', role: 'information', options: opts('north', 'south'), rule: { operator: 'is', value: 'north' } }),
      question('heard_from', { kind: 'free_text', role: 'information' }),
      question('height', { kind: 'number', role: 'information', min: 50, max: 250, rule: { operator: 'gt', value: 1000 } }),
    ]
    const without = evaluateEligibility({ questions: [age] }, { age: years }, TODAY)
    const withInfo = evaluateEligibility({ questions: [age, ...info] }, { age: years, region: 'south', heard_from: 'a poster', height: 9999 }, TODAY)
    const unanswered = evaluateEligibility({ questions: [age, ...info] }, { age: years }, TODAY)
    expect(withInfo).toEqual(without)
    expect(unanswered).toEqual(without)
  })

  it('ignores object-prototype members when an id such as constructor is unanswered', () => {
    const q = question('constructor', { kind: 'number', rule: { operator: 'gte', value: 18 } })
    expect(evaluateEligibility({ questions: [q] }, {}, TODAY).review.map((f) => f.reason)).toEqual(['missing'])
  })

  it('refuses a screening date that is not a calendar date', () => {
    expect(() => evaluateEligibility({ questions: [age] }, { age: 30 }, '2025-13-01')).toThrow(RangeError)
  })

  it('is eligible exactly when age ≥ 18, for every age from 0 to 120', () => {
    for (let years = 0; years <= 120; years++) {
      const { outcome } = evaluateEligibility({ questions: [age] }, { age: years }, TODAY)
      expect(outcome, `age ${years}`).toBe(years >= 18 ? 'eligible' : 'not_eligible')
    }
  })
})

describe('characteristicsFrom', () => {
  const region = question('region', { kind: 'single_choice', role: 'information', options: opts('north', 'south'), characteristic: 'region' })
  const gender = question('gender', { kind: 'single_choice', role: 'information', options: opts('woman', 'man', 'another'), characteristic: 'gender' })
  const plain = question('site', { kind: 'single_choice', role: 'information', options: opts('a', 'b') })

  it('maps each characteristic to the chosen option value', () => {
    expect(characteristicsFrom({ questions: [region, gender, plain] }, { region: 'south', gender: 'another', site: 'a' })).toEqual({ region: 'south', gender: 'another' })
  })

  it('leaves out missing answers and values not among the options', () => {
    expect(characteristicsFrom({ questions: [region, gender] }, { region: 'east' })).toEqual({})
    expect(characteristicsFrom({ questions: [region, gender] }, { gender: ['woman'] })).toEqual({})
  })
})
