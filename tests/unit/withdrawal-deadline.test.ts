import { describe, expect, it } from 'vitest'
import { describeWithdrawalRule, withinWithdrawalDeadline } from '../../shared/consent/index.js'
import { readability } from '../../shared/readability/index.js'
import type { WithdrawalRule } from '../../shared/schemas/recruitment.js'

// The deadlines follow the product's rules: an ethics board sets the limit on withdrawing data,
// which must be disclosed (TCPS 2 Art. 3.2, as cited in the security reference C.5). Counting the
// last day in full is common practice for "within N days".
const dates = (requestedOn: string, interviewDate: string | null = null, analysisStartedOn: string | null = null) => ({
  requestedOn,
  interviewDate,
  analysisStartedOn,
})

describe('withdrawal deadline', () => {
  it('allows withdrawal at any time under an any-time rule', () => {
    expect(withinWithdrawalDeadline({ kind: 'any_time' }, dates('2099-12-31', '2020-01-01', '2020-02-01'))).toBe(true)
  })

  it('allows day 30 after the interview and refuses day 31 under a 30-day rule', () => {
    const rule: WithdrawalRule = { kind: 'days_after_interview', days: 30 }
    expect(withinWithdrawalDeadline(rule, dates('2025-01-31', '2025-01-01'))).toBe(true)
    expect(withinWithdrawalDeadline(rule, dates('2025-02-01', '2025-01-01'))).toBe(false)
    // across a leap day: 2024-02-15 + 30 days = 2024-03-16
    expect(withinWithdrawalDeadline(rule, dates('2024-03-16', '2024-02-15'))).toBe(true)
    expect(withinWithdrawalDeadline(rule, dates('2024-03-17', '2024-02-15'))).toBe(false)
  })

  it('allows withdrawal before any interview under a days-after-interview rule', () => {
    expect(withinWithdrawalDeadline({ kind: 'days_after_interview', days: 14 }, dates('2025-06-01'))).toBe(true)
  })

  it('allows a request on the closing date and refuses the day after', () => {
    const rule: WithdrawalRule = { kind: 'until_date', date: '2025-06-30' }
    expect(withinWithdrawalDeadline(rule, dates('2025-06-30'))).toBe(true)
    expect(withinWithdrawalDeadline(rule, dates('2025-07-01'))).toBe(false)
  })

  it('allows withdrawal until the day before analysis starts, not on that day', () => {
    const rule: WithdrawalRule = { kind: 'until_analysis_starts' }
    expect(withinWithdrawalDeadline(rule, dates('2025-03-09', '2025-01-10', '2025-03-10'))).toBe(true)
    expect(withinWithdrawalDeadline(rule, dates('2025-03-10', '2025-01-10', '2025-03-10'))).toBe(false)
    expect(withinWithdrawalDeadline(rule, dates('2030-01-01', '2025-01-10', null))).toBe(true)
  })

  it('refuses a date that is not a calendar date', () => {
    expect(() => withinWithdrawalDeadline({ kind: 'until_date', date: '2025-06-30' }, dates('2025-02-30'))).toThrow(RangeError)
  })
})

describe('withdrawal rule in words for participants', () => {
  const rules: WithdrawalRule[] = [
    { kind: 'any_time' },
    { kind: 'days_after_interview', days: 30 },
    { kind: 'days_after_interview', days: 1 },
    { kind: 'until_date', date: '2026-05-31' },
    { kind: 'until_analysis_starts' },
  ]

  it('states each rule plainly', () => {
    expect(rules.map(describeWithdrawalRule)).toEqual([
      'You can ask for your data to be removed at any time.',
      'You can ask for your data to be removed up to 30 days after your interview.',
      'You can ask for your data to be removed up to 1 day after your interview.',
      'You can ask for your data to be removed up to and including 31 May 2026.',
      'You can ask for your data to be removed until we start to study what people told us. After that, we may not be able to take it out.',
    ])
  })

  it('keeps every description at grade 8 or below', () => {
    // Grade 8 guidance: Paasche-Orlow, Taylor & Brancati (2003), NEJM 348(8):721–726.
    for (const rule of rules) expect(readability(describeWithdrawalRule(rule))?.aboveGuidance).toBe(false)
  })
})
