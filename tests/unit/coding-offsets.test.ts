import { describe, expect, it } from 'vitest'
import { checkRange, isGraphemeBoundary, normaliseRange, overlaps, snapToGrapheme, trimRange } from '../../shared/coding/offsets.js'
import { assignLanes, blockIndexAt, readingBlocks, segmentBlocks, sentencesOf, wordStep, type Mark, type Span } from '../../shared/coding/segments.js'

/*
 * Sources.
 * - Offsets are UTF-16 code units: ECMAScript strings are sequences of 16-bit code units and
 *   `length`/`slice` count them (ECMA-262, section 6.1.4 "The String Type"); a code point above
 *   U+FFFF takes a surrogate pair (The Unicode Standard, chapter 3.9, UTF-16).
 * - Where a user-perceived character begins and ends: Unicode UAX #29 grapheme clusters
 *   ("Unicode Text Segmentation", Grapheme Cluster Boundary Rules): GB3 (CR × LF), GB6–GB8 (Hangul
 *   syllable sequences), GB9 (× Extend, e.g. U+0301 COMBINING ACUTE ACCENT), GB11 (emoji ZWJ
 *   sequences), GB12–GB13 (regional indicators pair into flags), GB999 (break everywhere else, so
 *   each Han character stands alone). Rule numbers and the examples below are from memory of UAX #29.
 * - Sentence ends: UAX #29 sentence boundaries, SB11 (break after a sentence terminator such as
 *   U+3002 IDEOGRAPHIC FULL STOP or "." followed by a space), from memory.
 * - NFC: UAX #15 "Unicode Normalization Forms": e + U+0301 composes to U+00E9.
 */

const family = '\u{1F468}\u200D\u{1F469}\u200D\u{1F467}' // man ZWJ woman ZWJ girl: one emoji
const flags = '\u{1F1F3}\u{1F1FF}\u{1F1E8}\u{1F1E6}' // NZ then CA: two flags
const accented = 'Cafe\u0301' // "Café" with a combining acute accent

describe('UTF-16 offsets (ECMAScript string semantics)', () => {
  it('counts an emoji outside the Basic Multilingual Plane as two code units and a Han character as one', () => {
    expect('\u{1F600}'.length).toBe(2)
    expect('家'.length).toBe(1)
    expect(family.length).toBe(8) // 2 + ZWJ + 2 + ZWJ + 2
    expect(flags.length).toBe(8) // four regional indicators, two units each
    expect(accented.length).toBe(5)
  })
})

describe('isGraphemeBoundary (UAX #29 grapheme clusters)', () => {
  it('keeps a letter and its combining accent together (GB9)', () => {
    expect(isGraphemeBoundary(accented, 3)).toBe(true)
    expect(isGraphemeBoundary(accented, 4)).toBe(false)
    expect(isGraphemeBoundary(accented, 5)).toBe(true)
  })

  it('never splits a surrogate pair', () => {
    const text = 'so \u{1F62B} tired'
    expect(isGraphemeBoundary(text, 3)).toBe(true)
    expect(isGraphemeBoundary(text, 4)).toBe(false)
    expect(isGraphemeBoundary(text, 5)).toBe(true)
  })

  it('treats an emoji ZWJ sequence as one character (GB11)', () => {
    const text = `We ${family} at home`
    for (let i = 4; i < 3 + family.length; i++) expect(isGraphemeBoundary(text, i), `index ${i}`).toBe(false)
    expect(isGraphemeBoundary(text, 3)).toBe(true)
    expect(isGraphemeBoundary(text, 3 + family.length)).toBe(true)
  })

  it('pairs regional indicators into flags (GB12, GB13)', () => {
    expect([0, 2, 4, 6, 8].map((i) => isGraphemeBoundary(flags, i))).toEqual([true, false, true, false, true])
  })

  it('breaks between Han characters (GB999) and keeps CR LF and Hangul jamo sequences whole (GB3, GB6–GB8)', () => {
    expect([0, 1, 2, 3].map((i) => isGraphemeBoundary('回家了', i))).toEqual([true, true, true, true])
    expect(isGraphemeBoundary('a\r\nb', 2)).toBe(false)
    const jamo = '\u1112\u1161\u11AB' // HIEUH + A + NIEUN: one syllable
    expect([1, 2].map((i) => isGraphemeBoundary(jamo, i))).toEqual([false, false])
  })

  it('counts both ends of the text as boundaries and nothing beyond them', () => {
    expect(isGraphemeBoundary('abc', 0)).toBe(true)
    expect(isGraphemeBoundary('abc', 3)).toBe(true)
    expect(isGraphemeBoundary('abc', 4)).toBe(false)
    expect(isGraphemeBoundary('abc', -1)).toBe(false)
  })
})

describe('snapToGrapheme', () => {
  it('moves a start back and an end forward to the edge of the character they cut', () => {
    const text = `Dad ${family} cried`
    expect(snapToGrapheme(text, 6, 'start')).toBe(4)
    expect(snapToGrapheme(text, 6, 'end')).toBe(4 + family.length)
    expect(snapToGrapheme(accented, 4, 'start')).toBe(3)
    expect(snapToGrapheme(accented, 4, 'end')).toBe(5)
  })

  it('leaves a boundary where it is and clamps outside the text', () => {
    expect(snapToGrapheme('回家了', 2, 'start')).toBe(2)
    expect(snapToGrapheme('abc', -5, 'start')).toBe(0)
    expect(snapToGrapheme('abc', 9, 'end')).toBe(3)
  })
})

describe('normaliseRange', () => {
  it('snaps to whole characters and trims white space from both ends', () => {
    const text = `  ${accented} and ${flags}\n`
    // starts inside the leading spaces, ends between the two indicators of the second flag
    const range = normaliseRange(text, 1, text.length - 3)
    expect(range).toEqual({ start: 2, end: text.length - 1 })
    expect(text.slice(range!.start, range!.end)).toBe(`${accented} and ${flags}`)
  })

  it('takes the accent along with a letter cut from it', () => {
    expect(normaliseRange(accented, 0, 4)).toEqual({ start: 0, end: 5 })
  })

  it('accepts a range selected backwards and refuses one of only spaces', () => {
    expect(normaliseRange('a tired day', 7, 2)).toEqual({ start: 2, end: 7 })
    expect(normaliseRange('a   b', 1, 4)).toBeNull()
  })

  it('trims with trimRange the same way on CJK text with ideographic spaces', () => {
    const text = '\u3000我很累\u3000'
    expect(trimRange(text, 0, text.length)).toEqual([1, 4])
  })
})

describe('checkRange', () => {
  const text = `He said 我很累。 ${family} then ${accented}.`

  it('accepts a normalised range whose quote matches', () => {
    const start = text.indexOf('我')
    const end = text.indexOf(family) + family.length
    expect(checkRange(text, start, end, text.slice(start, end))).toBeNull()
  })

  it('names the field of each problem', () => {
    expect(checkRange(text, -1, 3, 'He ')?.field).toBe('start')
    expect(checkRange(text, 0, text.length + 1, text)?.field).toBe('end')
    expect(checkRange(text, 4, 4, '')?.field).toBe('end')
    const inFamily = text.indexOf(family) + 2
    expect(checkRange(text, inFamily, text.length, text.slice(inFamily))?.field).toBe('start')
    expect(checkRange(text, 0, text.length - 2, text.slice(0, -2))?.field).toBe('end') // between e and U+0301
    expect(checkRange(text, 0, 2, 'Hi')?.field).toBe('text')
  })

  it('accepts a quote that differs only by composition (UAX #15 NFC)', () => {
    const composed = 'Caf\u00E9'
    expect(checkRange(composed, 0, 4, accented)).toBeNull()
  })
})

describe('a selection read from rendered pieces', () => {
  /*
   * A DOM-like rendering: the text cut into pieces at arbitrary places, each with its start offset,
   * as the coding view renders it. A selection boundary is (piece, offset within the piece's text);
   * the selected string is what lies between the two boundaries in the pieces.
   */
  const text = `Nobody told us 😫 what to expect. 我们回家了。 Then ${family} cried at the café door ${flags}.`
  const cuts = [0, 7, 15, 20, 33, 40, 45, 52, 70, text.length]
  const pieces = cuts.slice(0, -1).map((start, i) => ({ start, text: text.slice(start, cuts[i + 1]) }))
  const selectedString = (a: [number, number], b: [number, number]) => {
    if (a[0] === b[0]) return pieces[a[0]]!.text.slice(a[1], b[1])
    return pieces[a[0]]!.text.slice(a[1]) + pieces.slice(a[0] + 1, b[0]).map((p) => p.text).join('') + pieces[b[0]]!.text.slice(0, b[1])
  }
  const offsetOf = ([piece, offset]: [number, number]) => pieces[piece]!.start + offset

  it('gives offsets whose slice of the transcript is exactly the selected string', () => {
    const boundaries: [number, number][] = []
    pieces.forEach((p, i) => {
      for (let o = 0; o <= p.text.length; o++) boundaries.push([i, o])
    })
    for (let a = 0; a < boundaries.length; a += 3) {
      for (let b = a; b < boundaries.length; b += 5) {
        const start = offsetOf(boundaries[a]!)
        const end = offsetOf(boundaries[b]!)
        expect(text.slice(start, end)).toBe(selectedString(boundaries[a]!, boundaries[b]!))
      }
    }
  })

  it('then snaps and trims into a range the server accepts', () => {
    const from: [number, number] = [1, 8] // inside the surrogate pair of 😫
    const to: [number, number] = [6, 3] // inside the family emoji
    const range = normaliseRange(text, offsetOf(from), offsetOf(to))!
    expect(text.slice(range.start, range.end)).toBe(`😫 what to expect. 我们回家了。 Then ${family}`)
    expect(checkRange(text, range.start, range.end, text.slice(range.start, range.end))).toBeNull()
  })
})

describe('overlaps', () => {
  it('treats ranges as half-open', () => {
    expect(overlaps({ start: 0, end: 5 }, { start: 4, end: 9 })).toBe(true)
    expect(overlaps({ start: 0, end: 5 }, { start: 5, end: 9 })).toBe(false)
  })
})

describe('readingBlocks', () => {
  it('keeps text outside the turns as blocks of its own and skips blank gaps', () => {
    const text = 'Preface note.\n\nQ: How are you?\n\nA: Tired.\n\nEnd note'
    const q = text.indexOf('How')
    const a = text.indexOf('Tired')
    const turns = [
      { speaker: 'Participant', startMs: 2000, start: a, end: a + 'Tired.'.length },
      { speaker: 'Interviewer', startMs: 1000, start: q, end: q + 'How are you?'.length },
    ]
    const blocks = readingBlocks(text, turns)
    expect(blocks.map((b) => [b.speaker, text.slice(b.start, b.end)])).toEqual([
      [null, 'Preface note.\n\nQ:'],
      ['Interviewer', 'How are you?'],
      [null, 'A:'],
      ['Participant', 'Tired.'],
      [null, 'End note'],
    ])
  })

  it('gives the whole text as one block when there are no turns', () => {
    expect(readingBlocks('  just text ', [])).toEqual([{ key: 'gap-2', start: 2, end: 11, speaker: null, startMs: null }])
  })
})

describe('segmentBlocks', () => {
  /** An independent reference: the covering set of every single position, merged into runs. */
  function byCharacter(blocks: Span[], marks: Mark[]) {
    return blocks.map((block) => {
      const runs: { start: number; end: number; marks: string[] }[] = []
      for (let i = block.start; i < block.end; i++) {
        const over = marks
          .filter((m) => m.start <= i && i < m.end)
          .sort((x, y) => x.start - y.start || y.end - x.end || (x.id < y.id ? -1 : 1))
          .map((m) => m.id)
        const last = runs[runs.length - 1]
        if (last && last.end === i && last.marks.join() === over.join() && !marks.some((m) => m.start === i || m.end === i)) last.end = i + 1
        else runs.push({ start: i, end: i + 1, marks: over })
      }
      return runs
    })
  }

  // Expected segments below are worked out by hand from the offsets; the random case is checked
  // against an independent brute-force reference (the covering set of every single position).
  it('splits overlapping excerpts into segments that each know both excerpts', () => {
    const blocks = [{ start: 0, end: 30 }]
    const marks = [
      { id: 'fatigue', start: 5, end: 20 },
      { id: 'work', start: 12, end: 25 },
    ]
    expect(segmentBlocks(blocks, marks)).toEqual([
      [
        { start: 0, end: 5, marks: [] },
        { start: 5, end: 12, marks: ['fatigue'] },
        { start: 12, end: 20, marks: ['fatigue', 'work'] },
        { start: 20, end: 25, marks: ['work'] },
        { start: 25, end: 30, marks: [] },
      ],
    ])
  })

  it('carries an excerpt across a turn boundary into the next turn', () => {
    const blocks = [
      { start: 0, end: 10 },
      { start: 12, end: 20 },
    ]
    expect(segmentBlocks(blocks, [{ id: 'x', start: 6, end: 15 }])).toEqual([
      [
        { start: 0, end: 6, marks: [] },
        { start: 6, end: 10, marks: ['x'] },
      ],
      [
        { start: 12, end: 15, marks: ['x'] },
        { start: 15, end: 20, marks: [] },
      ],
    ])
  })

  it('agrees with a character-by-character reference on many random excerpts', () => {
    let seed = 7
    const random = (n: number) => {
      seed = (seed * 1103515245 + 12345) % 2147483648
      return seed % n
    }
    const blocks = [
      { start: 0, end: 40 },
      { start: 42, end: 90 },
      { start: 95, end: 140 },
    ]
    const marks = Array.from({ length: 60 }, (_, i) => {
      const start = random(140)
      return { id: `e${i}`, start, end: start + 1 + random(30) }
    })
    expect(segmentBlocks(blocks, marks)).toEqual(byCharacter(blocks, marks))
  })
})

describe('assignLanes', () => {
  // Greedy interval partitioning in order of start uses no more lanes than the deepest overlap
  // (interval-graph colouring; Kleinberg & Tardos, "Algorithm Design", 2005, section 4.1 — from memory).
  it('never gives overlapping excerpts the same lane and reuses a lane once it is free', () => {
    const marks = [
      { id: 'a', start: 0, end: 10 },
      { id: 'b', start: 5, end: 15 },
      { id: 'c', start: 10, end: 12 },
      { id: 'd', start: 11, end: 20 },
    ]
    const lanes = assignLanes(marks)
    expect(Object.fromEntries(lanes)).toEqual({ a: 0, b: 1, c: 0, d: 2 })
    for (const x of marks) for (const y of marks) if (x !== y && overlaps(x, y)) expect(lanes.get(x.id)).not.toBe(lanes.get(y.id))
  })
})

describe('wordStep and sentencesOf', () => {
  // Word and sentence edges are UAX #29 word and sentence boundaries (WB and SB rules, from memory).
  it('steps over whole words, an emoji counting as one', () => {
    const text = 'I was 😫 so tired'
    expect(wordStep(text, 0, 1)).toBe(1)
    expect(wordStep(text, 1, 1)).toBe(5)
    expect(wordStep(text, 5, 1)).toBe(8) // past the emoji, both code units
    expect(wordStep(text, text.length, -1)).toBe(text.indexOf('tired'))
    expect(wordStep(text, 0, -1)).toBe(0)
  })

  it('lands only on character boundaries in CJK text', () => {
    const text = '我们回家了，爸爸很累。'
    const stops = [0]
    for (let next = wordStep(text, 0, 1); next > stops[stops.length - 1]!; next = wordStep(text, next, 1)) stops.push(next)
    expect(stops.every((at) => isGraphemeBoundary(text, at))).toBe(true)
    // the last word ends before the closing 。, which is punctuation, not a word
    expect(stops[stops.length - 1]).toBe(text.length - 1)
    expect(stops.length).toBeGreaterThan(3)
  })

  it('finds sentences in Latin and CJK text, trimmed', () => {
    const text = 'She came home. 我很累。你呢？ Fine.'
    expect(sentencesOf(text, { start: 0, end: text.length }).map((s) => text.slice(s.start, s.end))).toEqual(['She came home.', '我很累。', '你呢？', 'Fine.'])
  })

  it('finds the block holding an offset by binary search', () => {
    const blocks = [
      { start: 0, end: 10 },
      { start: 12, end: 20 },
    ]
    expect([0, 9, 10, 12, 19, 20].map((o) => blockIndexAt(blocks, o))).toEqual([0, 0, 1, 1, 1, -1])
  })
})
