import { describe, expect, it } from 'vitest'
import { applyRedactions, PlaceholderRegistry, scanForIdentifiers } from '../../shared/deidentify/index.js'

// Practice source: UK Data Service, Anonymising qualitative data (check-values §4) — replace rather than
// blank out, keep replacements consistent across the study, mark them visibly, log every change.

describe('PlaceholderRegistry', () => {
  it('numbers placeholders per category in the order terms are met', () => {
    const registry = new PlaceholderRegistry()
    expect(registry.placeholderFor('Agnes Pellow', 'name')).toBe('[NAME-1]')
    expect(registry.placeholderFor('Tamsin Reeve', 'name')).toBe('[NAME-2]')
    expect(registry.placeholderFor('Marlow Creek', 'location')).toBe('[PLACE-1]')
    expect(registry.placeholderFor('14 March 2021', 'date')).toBe('[DATE-1]')
    expect(registry.placeholderFor('MRN 00482913', 'record-number')).toBe('[RECORD-NO-1]')
    expect(registry.placeholderFor('PL-2290118', 'health-plan-number')).toBe('[PLAN-NO-1]')
    expect(registry.placeholderFor('40072918', 'other-id')).toBe('[ID-1]')
  })

  it('gives the same person the same placeholder whatever the case, spacing or Unicode composition', () => {
    const registry = new PlaceholderRegistry()
    const first = registry.placeholderFor('Zoë Carrow', 'name') // composed ë
    expect(registry.placeholderFor('zoe\u0308   CARROW', 'name')).toBe(first) // decomposed e + diaeresis
    expect(registry.placeholderFor('  Zoë\nCarrow ', 'name')).toBe(first)
    expect(registry.placeholderFor('Zoe Carrow', 'name')).not.toBe(first) // a different spelling is a different term
  })

  it('survives a round trip through its stored form and carries on numbering', () => {
    const registry = new PlaceholderRegistry()
    registry.placeholderFor('Agnes Pellow', 'name')
    registry.placeholderFor('Eastbrook', 'location')
    const stored = JSON.parse(JSON.stringify(registry))
    expect(stored).toEqual({
      'agnes pellow': { placeholder: '[NAME-1]', category: 'name' },
      eastbrook: { placeholder: '[PLACE-1]', category: 'location' },
    })
    const reloaded = new PlaceholderRegistry(stored)
    expect(reloaded.placeholderFor('AGNES PELLOW', 'name')).toBe('[NAME-1]')
    expect(reloaded.placeholderFor('Bethan', 'name')).toBe('[NAME-2]')
  })

  it('refuses a stored entry that is not a placeholder', () => {
    expect(() => new PlaceholderRegistry({ x: { placeholder: 'NAME 1', category: 'name' } })).toThrow(TypeError)
  })
})

describe('applyRedactions', () => {
  it('replaces flagged spans and logs each change with its original offsets', () => {
    const text = 'Agnes Pellow rang 07700 900381. Later Agnes Pellow rang again.'
    const flags = scanForIdentifiers(text, { studyTerms: [{ term: 'Agnes Pellow', category: 'name' }], defaultCountry: 'GB' })
    const { text: redacted, log } = applyRedactions(text, flags, new PlaceholderRegistry())
    expect(redacted).toBe('[NAME-1] rang [PHONE-1]. Later [NAME-1] rang again.')
    expect(log).toEqual([
      { original: 'Agnes Pellow', placeholder: '[NAME-1]', category: 'name', start: 0, end: 12 },
      { original: '07700 900381', placeholder: '[PHONE-1]', category: 'phone', start: 18, end: 30 },
      { original: 'Agnes Pellow', placeholder: '[NAME-1]', category: 'name', start: 38, end: 50 },
    ])
  })

  it('counts offsets in UTF-16 code units, so an emoji before the span takes two', () => {
    const text = 'Mum 😀 lives in Eastbrook.'
    const start = text.indexOf('Eastbrook')
    expect(start).toBe(16) // "Mum " 4 + emoji 2 + " lives in " 10
    const [flag] = scanForIdentifiers(text, { studyTerms: [{ term: 'Eastbrook', category: 'location' }] })
    expect(flag).toEqual({ start, end: start + 9, category: 'location', text: 'Eastbrook' })
    expect(applyRedactions(text, [flag], new PlaceholderRegistry()).text).toBe('Mum 😀 lives in [PLACE-1].')
  })

  it('keeps compromise-found names on the right characters after an emoji', () => {
    const text = '😀😀 Then my sister Bethan phoned from Harwick Vale.'
    const flags = scanForIdentifiers(text)
    expect(flags.map((f) => [f.category, f.text, text.slice(f.start, f.end)])).toEqual([
      ['name', 'Bethan', 'Bethan'],
      ['location', 'Harwick Vale', 'Harwick Vale'],
    ])
  })

  it('accepts redactions in any order and works from the end backwards', () => {
    const text = 'Bethan and Lucan'
    const redactions = [
      { start: 11, end: 16, category: 'name' as const, text: 'Lucan' },
      { start: 0, end: 6, category: 'name' as const, text: 'Bethan' },
    ]
    expect(applyRedactions(text, redactions, new PlaceholderRegistry()).text).toBe('[NAME-1] and [NAME-2]')
  })

  it('refuses overlapping, out-of-range, stale or character-splitting spans', () => {
    const registry = new PlaceholderRegistry()
    const text = 'Agnes Pellow 😀'
    const span = (start: number, end: number) => ({ start, end, category: 'name' as const, text: text.slice(start, end) })
    expect(() => applyRedactions(text, [span(0, 5), span(3, 12)], registry)).toThrow(RangeError)
    expect(() => applyRedactions(text, [span(0, 40)], registry)).toThrow(RangeError)
    expect(() => applyRedactions(text, [span(-1, 5)], registry)).toThrow(RangeError)
    expect(() => applyRedactions(text, [{ ...span(0, 5), text: 'Bethan' }], registry)).toThrow(RangeError)
    expect(() => applyRedactions(text, [span(6, 14)], registry)).toThrow(RangeError) // ends inside the emoji
  })
})
