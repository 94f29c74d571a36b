// Dates more specific than a year, and ages over 89 — HIPAA Safe Harbor, 45 CFR 164.514(b)(2)(i)(C).
// A bare year ("in 2019") is kept by the rule and never flagged.
import { candidate, type Candidate } from '../categories.js'
import { RANK } from './patterns.js'

const MONTH = '(?:January|February|March|April|May|June|July|August|September|October|November|December|(?:Jan|Feb|Mar|Apr|Jun|Jul|Aug|Sept?|Oct|Nov|Dec)\\.?)'
const WEEKDAY = '(?:Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday|(?:Mon|Tues?|Wed|Thur?s?|Fri|Sat|Sun)\\.?)'
const ORDINAL_WORD = '(?:(?:twenty|thirty)[- ]?)?(?:first|second|third|fourth|fifth|sixth|seventh|eighth|ninth)|tenth|eleventh|twelfth|thirteenth|fourteenth|fifteenth|sixteenth|seventeenth|eighteenth|nineteenth|twentieth|thirtieth'
const ORD = `(?:\\d{1,2}(?:st|nd|rd|th)?|${ORDINAL_WORD})`
// Named days that fix a date within the year (common practice: they date an admission as surely as "24 December").
const HOLIDAY = "(?:Christmas (?:Eve|Day)|Boxing Day|New Year['’]s (?:Eve|Day)|Hogmanay|Good Friday|Easter (?:Sunday|Monday|Day)|Thanksgiving(?: Day)?|Independence Day|Canada Day|Remembrance Day|Veterans Day|Memorial Day|Labou?r Day|Halloween|Bonfire Night|Valentine['’]s Day)"

const YEAR = '(?:,?\\s+\\d{4}(?!\\d))?'

const DATE_PATTERNS: RegExp[] = [
  // 14 March 2021 · the 3rd of May · Monday 16th May · the 12th of January 2022
  new RegExp(`\\b(?:${WEEKDAY},?\\s+)?(?:[Tt]he\\s+)?${ORD}(?:\\s+of)?\\s+${MONTH}(?![a-z])${YEAR}`, 'g'),
  // March 22, 2022 · January 14 · December 3rd · Friday, May the 9th
  new RegExp(`\\b(?:${WEEKDAY},?\\s+)?${MONTH}\\s+(?:the\\s+)?${ORD}(?![\\d:])(?![a-z])${YEAR}`, 'g'),
  // March 2021 (month and year: the month is a date element)
  new RegExp(`\\b${MONTH}(?![a-z]),?\\s+\\d{4}(?!\\d)`, 'g'),
  // Tuesday the 5th · Friday the twelfth
  new RegExp(`\\b${WEEKDAY},?\\s+the\\s+(?:\\d{1,2}(?:st|nd|rd|th)|${ORDINAL_WORD})\\b`, 'g'),
  // Christmas Eve · Boxing Day 2021
  new RegExp(`\\b${HOLIDAY}${YEAR}`, 'g'),
  // 14/03/2021 · 7/4/22 · 17.10.2021 · 2021-03-14 · 2021/03/14
  /(?<![\d./-])(?:\d{1,2}([/.-])\d{1,2}\1(?:\d{4}|\d{2})|\d{4}([/.-])\d{1,2}\2\d{1,2})(?![\d]|[./-]\d)/g,
]

function plausibleNumeric(s: string): boolean {
  const parts = s.split(/[/.-]/).map(Number)
  const [a, b] = parts[0] > 31 ? [parts[1], parts[2]] : [parts[0], parts[1]]
  return a >= 1 && b >= 1 && a <= 31 && b <= 31 && (a <= 12 || b <= 12)
}

export function detectDates(text: string): Candidate[] {
  const found: Candidate[] = []
  DATE_PATTERNS.forEach((pattern, i) => {
    for (const m of text.matchAll(pattern)) {
      if (i === DATE_PATTERNS.length - 1 && !plausibleNumeric(m[0])) continue
      found.push(candidate(text, m.index, m.index + m[0].length, 'date', RANK.date))
    }
  })
  return found
}

const TENS = 'ninety|one hundred|a hundred|hundred'
const UNITS = 'one|two|three|four|five|six|seven|eight|nine'
const WORD_AGE = `(?:(?:${TENS})(?:[- ](?:and[- ])?(?:${UNITS}))?)`
const NUMBER = `(?:\\d{2,3}|${WORD_AGE})`
const CUE = "(?:I['’]m|I am|I was|(?:he|she)(?:['’]s|\\s+is|\\s+was|['’]ll\\s+be|\\s+will\\s+be|\\s+would\\s+be)|turn(?:s|ed|ing)|aged?|age\\s+of|reached|now)"
// Numbers followed by a unit are measurements, not ages (common practice).
const NOT_UNIT = '(?![\\w%]|\\s*(?:%|percent|per\\s+cent|kg|kilos?|pounds|lbs?|stone|mg|ml|minutes?|mins?|seconds?|hours?|days?|weeks?|months?|miles?|km|metres?|meters?|feet|times|people|beds|dollars|quid|pence|bpm|over)\\b)'
const AGE_PATTERNS: RegExp[] = [
  new RegExp(`\\b${CUE}\\s+(${NUMBER})${NOT_UNIT}`, 'gi'),
  new RegExp(`\\b(${NUMBER})[- ]years?[- ]old\\b`, 'gi'),
]

const WORD_VALUES: Record<string, number> = { one: 1, two: 2, three: 3, four: 4, five: 5, six: 6, seven: 7, eight: 8, nine: 9 }

/** The age a matched number states, digits or words ("ninety-one", "a hundred and two"). */
export function ageValue(words: string): number {
  if (/^\d+$/.test(words)) return Number(words)
  const lower = words.toLowerCase()
  const base = /hundred/.test(lower) ? 100 : 90
  const unit = /(one|two|three|four|five|six|seven|eight|nine)$/.exec(lower)
  return base + (unit ? WORD_VALUES[unit[1]] : 0)
}

export function detectAgesOver89(text: string): Candidate[] {
  const found: Candidate[] = []
  AGE_PATTERNS.forEach((pattern, i) => {
    for (const m of text.matchAll(pattern)) {
      const age = ageValue(m[1])
      if (age <= 89 || age > 125) continue
      // The flag covers the number only: after the cue it ends the match, before "years old" it starts it.
      const start = i === 0 ? m.index + m[0].length - m[1].length : m.index
      found.push(candidate(text, start, start + m[1].length, 'age', RANK.age))
    }
  })
  return found
}
