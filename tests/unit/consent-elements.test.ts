import { describe, expect, it } from 'vitest'
import { CONSENT_ELEMENT_SOURCES, CONSENT_ELEMENTS } from '../../shared/consent/index.js'

// The list paraphrases 45 CFR 46.116(b) (from memory) and TCPS 2 (2022) Art. 3.2, as summarised in
// the check-values reference, section 6.
describe('consent elements checklist', () => {
  it('gives every element a unique lower_snake_case key that a form checklist accepts', () => {
    const keys = CONSENT_ELEMENTS.map((e) => e.key)
    expect(new Set(keys).size).toBe(keys.length)
    for (const key of keys) expect(key).toMatch(/^[a-z][a-z0-9_]{0,39}$/)
  })

  it('cites at least one known source for every element', () => {
    for (const element of CONSENT_ELEMENTS) {
      expect(element.sources.length).toBeGreaterThan(0)
      for (const source of element.sources) expect(CONSENT_ELEMENT_SOURCES[source].citation).not.toBe('')
    }
  })

  it('covers both the US and the Canadian lists with at least 8 elements each', () => {
    const count = (source: 'common_rule' | 'tcps2') => CONSENT_ELEMENTS.filter((e) => e.sources.includes(source)).length
    expect(count('common_rule')).toBeGreaterThanOrEqual(8)
    expect(count('tcps2')).toBeGreaterThanOrEqual(8)
  })

  it('merges an element both sources require into one item', () => {
    expect(CONSENT_ELEMENTS.find((e) => e.key === 'research_and_purpose')?.sources).toEqual(['common_rule', 'tcps2'])
  })
})
