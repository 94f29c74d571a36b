import { describe, expect, it } from 'vitest'
import { krippendorffAlpha } from '../../shared/analysis/agreement.js'
import { studyAgreement, unitsOf, type CodedExcerpt, type Span } from '../../shared/analysis/study-agreement.js'

/** Ten units of one transcript, one per line, and excerpts where a coder's row has a 1. */
function fromRows(rows: Record<string, number[]>, code = 'x') {
  const text = Array.from({ length: rows[Object.keys(rows)[0]!]!.length }, (_, i) => `Unit number ${i + 1} here.`).join('\n')
  const units: Span[] = []
  let at = 0
  for (const line of text.split('\n')) {
    units.push({ start: at, end: at + line.length })
    at += line.length + 1
  }
  const excerpts: CodedExcerpt[] = Object.entries(rows).flatMap(([coderId, bits]) =>
    bits.flatMap((bit, i) => (bit ? [{ transcriptId: 't1', coderId, start: units[i]!.start + 2, end: units[i]!.end - 2, codeIds: [code] }] : [])),
  )
  // each coder also coded the transcript with another code somewhere, so they count as having coded it
  for (const coderId of Object.keys(rows)) excerpts.push({ transcriptId: 't1', coderId, start: 0, end: 3, codeIds: ['other'] })
  return { units: new Map([['t1', units]]), excerpts, text }
}

describe('agreement for a study', () => {
  it('reproduces Krippendorff (2011), binary example: alpha 0.095, with percent agreement 0.600 and kappa 0.0909 (derived)', () => {
    const { units, excerpts } = fromRows({ A: [0, 1, 0, 0, 0, 0, 0, 0, 1, 0], B: [1, 1, 1, 0, 0, 1, 0, 0, 0, 0] })
    const result = studyAgreement({ units, excerpts, coderIds: ['A', 'B'], codeIds: ['x'] })
    const x = result.perCode[0]!
    expect(result.units).toBe(10)
    expect(x.codedBy).toEqual([2, 4])
    expect(x.percentAgreement).toBeCloseTo(0.6, 3)
    expect(x.kappa).toEqual({ value: expect.closeTo(0.090909, 5) })
    expect(x.alpha).toEqual({ value: expect.closeTo(0.095, 3) })
    expect(result.disagreementCount).toBe(4)
    expect(result.disagreements.map((d) => [d.codedBy, d.notCodedBy])).toContainEqual([['B'], ['A']])
  })

  it('counts a unit as coded when any excerpt with the code overlaps it, even by one character (common practice)', () => {
    const units = new Map([['t1', [{ start: 0, end: 10 }, { start: 11, end: 20 }]]])
    const excerpts: CodedExcerpt[] = [
      { transcriptId: 't1', coderId: 'A', start: 9, end: 12, codeIds: ['x'] }, // touches both units
      { transcriptId: 't1', coderId: 'B', start: 0, end: 10, codeIds: ['x'] }, // first unit only
      { transcriptId: 't1', coderId: 'B', start: 10, end: 11, codeIds: ['x'] }, // the gap between units: no unit
    ]
    const result = studyAgreement({ units, excerpts, coderIds: ['A', 'B'], codeIds: ['x'] })
    expect(result.perCode[0]!.codedBy).toEqual([2, 1])
    expect(result.disagreements).toEqual([expect.objectContaining({ start: 11, end: 20, codedBy: ['A'], notCodedBy: ['B'] })])
  })

  it('matches the general alpha for three coders with a coder missing from some transcripts (seeded random data)', () => {
    let seed = 7
    const random = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31)
    for (let trial = 0; trial < 20; trial++) {
      const units = new Map<string, Span[]>()
      const excerpts: CodedExcerpt[] = []
      const data: (number | null)[][] = [[], [], []]
      for (const t of ['t1', 't2', 't3']) {
        const spans = Array.from({ length: 12 }, (_, i) => ({ start: i * 10, end: i * 10 + 8 }))
        units.set(t, spans)
        const coders = t === 't2' ? [0, 1] : [0, 1, 2] // the third coder did not code t2
        for (const [i, span] of spans.entries()) {
          for (let c = 0; c < 3; c++) {
            if (!coders.includes(c)) {
              data[c]!.push(null)
              continue
            }
            const bit = random() < 0.4 ? 1 : 0
            data[c]!.push(bit)
            if (bit) excerpts.push({ transcriptId: t, coderId: `c${c}`, start: span.start + 1, end: span.end - 1, codeIds: ['x'] })
          }
          if (i === 0) for (const c of coders) excerpts.push({ transcriptId: t, coderId: `c${c}`, start: 0, end: 1, codeIds: ['marker'] })
        }
      }
      const result = studyAgreement({ units, excerpts, coderIds: ['c0', 'c1', 'c2'], codeIds: ['x'] })
      const general = krippendorffAlpha(data, 'nominal')
      expect(result.perCode[0]!.alpha).toEqual({ value: expect.closeTo(general, 10) })
      expect(result.perCode[0]!.kappa).toBeNull() // three coders: no Cohen's kappa
    }
  })

  it('explains, never NaN: a code nobody used, and a study where only one coder coded', () => {
    const { units, excerpts } = fromRows({ A: [1, 0, 1], B: [1, 0, 0] })
    const result = studyAgreement({ units, excerpts, coderIds: ['A', 'B'], codeIds: ['x', 'unused'] })
    const unused = result.perCode[1]!
    expect(unused.percentAgreement).toBe(1)
    expect(unused.kappa).toMatchObject({ undefined: 'no-variation' })
    expect(unused.alpha).toMatchObject({ undefined: 'no-variation' })
    const single = studyAgreement({ units, excerpts: excerpts.filter((e) => e.coderId === 'A'), coderIds: ['A', 'B'], codeIds: ['x'] })
    expect(single.units).toBe(0)
    expect(single.perCode[0]!.percentAgreement).toBeNull()
    expect(single.perCode[0]!.alpha).toMatchObject({ undefined: expect.any(String) })
    expect(JSON.stringify(single)).not.toMatch(/NaN/)
  })

  it('cuts turns into sentences with Intl.Segmenter (Unicode UAX #29), trimming white space', () => {
    const text = 'Interviewer: Hello.\nP: It was hard. The stairs! Then help came.'
    const turns = [{ start: 13, end: 19 }, { start: 23, end: text.length }]
    expect(unitsOf(text, turns, 'turn').map((u) => text.slice(u.start, u.end))).toEqual(['Hello.', 'It was hard. The stairs! Then help came.'])
    expect(unitsOf(text, turns, 'sentence').map((u) => text.slice(u.start, u.end))).toEqual(['Hello.', 'It was hard.', 'The stairs!', 'Then help came.'])
    expect(unitsOf('  \n', [{ start: 0, end: 3 }], 'turn')).toEqual([]) // a turn without text gives no unit
  })
})
