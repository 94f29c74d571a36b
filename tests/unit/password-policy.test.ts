import { describe, expect, it } from 'vitest'
import { codePointLength, isRepetitiveOrSequential, passwordProblems, PASSWORD_MIN_CODE_POINTS } from '../../shared/passwords/policy.js'

/** NIST SP 800-63B-4 §3.1.1.2 (15 code points for single-factor, NFKC, no composition rules, blocklist of whole values). */
describe('password policy', () => {
  it('counts Unicode code points, not UTF-16 units (NIST SP 800-63B-4 §3.1.1.2)', () => {
    expect(codePointLength('🌿'.repeat(3))).toBe(3)
    expect('🌿'.repeat(3).length).toBe(6)
  })

  it('sets the minimum at 15 and accepts exactly 15 (NIST SP 800-63B-4 §3.1.1.2)', () => {
    expect(PASSWORD_MIN_CODE_POINTS).toBe(15)
    expect(passwordProblems({ password: 'walk the dog at' })).toEqual([])
    expect(passwordProblems({ password: 'walk the dog a' })[0]).toMatch(/at least 15 characters \(this one has 14\)/)
  })

  it('normalises with NFKC before counting: a full-width passphrase counts as its plain form', () => {
    expect(passwordProblems({ password: 'ｆｕｌｌ ｗｉｄｔｈ ｐａｓｓ' })).toEqual([])
  })

  it('imposes no composition rules: an all-lower-case passphrase passes (ASVS 5.0 6.2.5)', () => {
    expect(passwordProblems({ password: 'correct horse battery staple' })).toEqual([])
  })

  it('refuses a listed common password by its whole value, not by substring (NIST SP 800-63B-4 §3.1.1.2)', () => {
    const common = new Set(['passwordpassword'])
    expect(passwordProblems({ password: 'PasswordPassword', commonPasswords: common })[0]).toMatch(/commonly used/)
    expect(passwordProblems({ password: 'my passwordpassword is long and odd', commonPasswords: common })).toEqual([])
  })

  it('refuses passwords built from context words, including the e-mail local part (ASVS 5.0 6.2.11)', () => {
    expect(passwordProblems({ password: 'Coming Home After Stroke', contextWords: ['Coming Home After Stroke'] })[0]).toMatch(/built from/)
    expect(passwordProblems({ password: 'jane.doe.example!!', contextWords: ['jane.doe@example.org'] })[0]).toMatch(/built from/)
    expect(passwordProblems({ password: 'jane walks along the quiet river', contextWords: ['jane@example.org'] })).toEqual([])
  })

  it('recognises repeated and sequential patterns (NIST SP 800-63B rev. 3 §5.1.1.2)', () => {
    expect(isRepetitiveOrSequential('aaaaaaaaaaaaaaa')).toBe(true)
    expect(isRepetitiveOrSequential('abcdabcdabcdabcd')).toBe(true)
    expect(isRepetitiveOrSequential('123456789012345')).toBe(true)
    expect(isRepetitiveOrSequential('zyxwvutsrqponml')).toBe(true)
    expect(isRepetitiveOrSequential('the river at dusk')).toBe(false)
  })
})
