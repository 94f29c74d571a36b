import { describe, expect, it } from 'vitest'
import { IDENTIFIER_CATEGORIES, scanForIdentifiers } from '../../shared/deidentify/index.js'
import { evaluate, formatTable } from '../fixtures/deidentify/evaluate.js'
import { longTranscript } from '../fixtures/deidentify/long-transcript.js'
import { locate, locateDecoys, PASSAGES } from '../fixtures/deidentify/passages.js'

// The test set: invented caregiver passages with planted identifiers (tests/fixtures/deidentify/passages.ts).
// Thresholds are ours (common practice for an assisting tool: the structured categories should almost
// never be missed; names are harder). The categories follow 45 CFR 164.514(b)(2)(i)(A)–(R).

describe('the invented test set', () => {
  it('holds at least 30 passages and 150 planted identifiers, every category at least 3 times', () => {
    expect(PASSAGES.length).toBeGreaterThanOrEqual(30)
    const planted = PASSAGES.flatMap((p) => locate(p.text, p.planted)) // throws if an annotation is not in its text
    expect(planted.length).toBeGreaterThanOrEqual(150)
    for (const category of IDENTIFIER_CATEGORIES) {
      expect(planted.filter((p) => p.category === category).length, category).toBeGreaterThanOrEqual(3)
    }
    expect(planted.filter((p) => p.kind === 'postal').length).toBeGreaterThanOrEqual(3)
  })
})

describe('scanner recall and precision on the test set', () => {
  const withTerms = evaluate()
  const withoutTerms = evaluate([])
  console.log(`De-identification scanner, with study terms\n${formatTable(withTerms.scores)}`)
  console.log(`Without study terms (name and place rows)\n${formatTable(withoutTerms.scores.filter((s) => ['name', 'location'].includes(s.group)))}`)
  console.log(`Missed: ${withTerms.misses.map((m) => `${m.category} "${m.text}"`).join('; ')}`)
  console.log(`False flags: ${withTerms.falseFlags.map((f) => `${f.category} "${f.text}"`).join('; ')}`)
  const score = (group: string) => withTerms.scores.find((s) => s.group === group)!

  it.each(['email', 'phone', 'date', 'postal'])('finds at least 95%% of planted %s identifiers', (group) => {
    expect(score(group).recall).toBeGreaterThanOrEqual(0.95)
  })

  it('finds at least 85% of planted person names', () => {
    expect(score('name').recall).toBeGreaterThanOrEqual(0.85)
  })

  it('keeps overall precision at 0.7 or better', () => {
    expect(score('ALL').precision).toBeGreaterThanOrEqual(0.7)
  })

  it('never flags a bare year, an age of 89 or under, or the ward name', () => {
    // Safe Harbor keeps the year and ages up to 89: 45 CFR 164.514(b)(2)(i)(C).
    const ruleDecoys = /^(?:\d{4}|\d{1,2}|eighty-eight|Stroke Unit|ward 7|bed 12)$/
    const hits = withTerms.decoyHits.filter((f) => PASSAGES.some((p) =>
      locateDecoys(p.text, p.decoys.filter((d) => ruleDecoys.test(d))).some((d) => p.text.slice(d.start, d.end) === f.text)))
    expect(hits).toEqual([])
    expect(withTerms.decoyHits.length).toBeLessThanOrEqual(2)
  })
})

describe('scanner speed', () => {
  it('scans a 30,000-word transcript (time is logged, not asserted)', () => {
    const text = longTranscript(30_000)
    scanForIdentifiers(text.slice(0, 2_000)) // warm up compromise's lexicon
    const started = performance.now()
    const flags = scanForIdentifiers(text, { defaultCountry: 'GB' })
    console.log(`Scanned ${text.split(/\s+/).length} words in ${(performance.now() - started).toFixed(0)} ms (${flags.length} flags)`)
    expect(flags.length).toBeGreaterThan(0)
  })
})
