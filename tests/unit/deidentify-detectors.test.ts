import { describe, expect, it } from 'vitest'
import { IDENTIFIER_CATEGORIES, scanForIdentifiers, type ScanOptions } from '../../shared/deidentify/index.js'

// Small invented examples, one behaviour each. Categories: 45 CFR 164.514(b)(2)(i)(A)–(R); where a
// pattern choice is ours (cue words, unit words, label lists) it is marked common practice.
const found = (text: string, options?: ScanOptions) => scanForIdentifiers(text, options).map((f) => [f.category, f.text])

describe('IDENTIFIER_CATEGORIES', () => {
  it('lists the 17 text categories in a fixed order', () => {
    expect(IDENTIFIER_CATEGORIES).toEqual(['name', 'location', 'date', 'age', 'phone', 'fax', 'email', 'ssn', 'record-number',
      'health-plan-number', 'account-number', 'licence-number', 'vehicle-id', 'device-id', 'url', 'ip-address', 'other-id'])
  })
})

describe('names and places (A), (B)', () => {
  it('finds an honorific with a surname', () => {
    expect(found('Then Dr Okafor came, and later Mrs. Lind.')).toEqual([['name', 'Dr Okafor'], ['name', 'Mrs. Lind']])
  })
  it('finds a person introduced by a role word, and a town after a preposition (common practice)', () => {
    expect(found('The assessor, Philippa Grange, came from Thornbeck.')).toEqual([['name', 'Philippa Grange'], ['location', 'Thornbeck']])
  })
  it('finds a street address with its town', () => {
    expect(found('They moved her to 9 Tern Court, Ashby Cross last week.')).toEqual([['location', '9 Tern Court, Ashby Cross']])
  })
  it('leaves states alone, which Safe Harbor keeps (B)', () => {
    expect(found('She lives in Kettle Ford, Montana now.')).toEqual([['location', 'Kettle Ford']])
  })
  it('does not flag ward names or ordinary sentence openers', () => {
    expect(found('Honestly, the Stroke Unit was good. Physio came daily.')).toEqual([])
  })
  it('matches the study list whole-word and case-insensitively', () => {
    const studyTerms = [{ term: 'Pellow', category: 'name' as const }]
    expect(found('pellow said the Pellows were away; PELLOW agreed.', { studyTerms })).toEqual([['name', 'pellow'], ['name', 'PELLOW']])
  })
})

describe('dates (C) — any element more specific than the year', () => {
  it.each(['14 March 2021', 'March 14, 2021', '14/03/2021', '2021-03-14', 'the 3rd of May', 'Tuesday the 5th', 'March 2021',
    'Christmas Eve', 'the fifth of March', '17.10.2021'])('flags "%s"', (date) => {
    expect(found(`It happened on ${date} I think.`)).toEqual([['date', date]])
  })
  it('does not flag a bare year, which Safe Harbor keeps', () => {
    expect(found('In 2019 she was fine.')).toEqual([])
  })
})

describe('ages (C) — only over 89', () => {
  it.each([["I'm 92", '92'], ['aged 94', '94'], ['93 years old', '93'], ['ninety-one', 'ninety-one'], ["she's 103", '103']])(
    'flags the age in "%s"', (phrase, age) => {
      expect(found(`Well, ${phrase === 'ninety-one' ? 'she was ninety-one' : phrase}, you know.`)).toEqual([['age', age]])
    })
  it.each(['she was 74', "he's 89", 'she was 92 kilos'])('leaves "%s" alone', (phrase) => {
    expect(found(`Then ${phrase} at the time.`)).toEqual([])
  })
})

describe('phone and fax (D), (E)', () => {
  it('finds North American and UK numbers with libphonenumber-js', () => {
    expect(found('Call (207) 555-0143 or 503-555-0178.')).toEqual([['phone', '(207) 555-0143'], ['phone', '503-555-0178']])
    expect(found('Her mobile is 07700 900381.', { defaultCountry: 'GB' })).toEqual([['phone', '07700 900381']])
  })
  it('calls a number after "fax" a fax number', () => {
    expect(found('Ring 415-555-0190, or their fax number is 415-555-0191.')).toEqual([['phone', '415-555-0190'], ['fax', '415-555-0191']])
  })
})

describe('e-mail, URL and IP (F), (N), (O)', () => {
  it('finds an e-mail address without the full stop after it', () => {
    expect(found('Write to k.marsh@example.com.')).toEqual([['email', 'k.marsh@example.com']])
  })
  it('finds http(s) and www addresses', () => {
    expect(found('See https://example.org/alarms?id=7 and www.example.com/carers.')).toEqual([
      ['url', 'https://example.org/alarms?id=7'], ['url', 'www.example.com/carers']])
  })
  it('finds IPv4 and compressed IPv6 but not clock times', () => {
    expect(found('At 10:30 the log showed 192.0.2.44 and 2001:db8::4f2a.')).toEqual([['ip-address', '192.0.2.44'], ['ip-address', '2001:db8::4f2a']])
  })
})

describe('numbers (G)–(M), (R)', () => {
  it('finds a formatted SSN, and nine bare digits only after an SSN label', () => {
    expect(found('SSN 987-65-4321.')).toEqual([['ssn', '987-65-4321']])
    expect(found('Her social security number is 987654329.')).toEqual([['ssn', '987654329']])
  })
  it.each([
    ['MRN 00482913', 'record-number', '00482913'],
    ['her chart no. C-55102', 'record-number', 'C-55102'],
    ['the member ID, which is XKW4482109', 'health-plan-number', 'XKW4482109'],
    ['policy number PL-2290118', 'health-plan-number', 'PL-2290118'],
    ['acct 00471128', 'account-number', '00471128'],
    ["driver's licence number D4471-22904-81", 'licence-number', 'D4471-22904-81'],
    ['licence plate KV68 XRT', 'vehicle-id', 'KV68 XRT'],
    ['VIN 1HW4X2290PQ118427', 'vehicle-id', '1HW4X2290PQ118427'],
    ['pacemaker serial PX-7741-0092', 'device-id', 'PX-7741-0092'],
  ])('reads "%s" by its label', (phrase, category, number) => {
    expect(found(`It said ${phrase} on it.`)).toEqual([[category, number]])
  })
  it('does not take a label without a number ("his licence number taken off him")', () => {
    expect(found('He had his licence number taken off him.')).toEqual([])
  })
  it('flags other long numbers as other-id, but not short ones', () => {
    expect(found('The tracking reference 5512 9987 3301 and ward 7, bed 12.')).toEqual([['other-id', '5512 9987 3301']])
  })
})

describe('postal codes (B)', () => {
  it.each([['ZIP 04987', '04987'], ['OR 97204-1180', '97204-1180'], ['Tollbury TB7 2QE', 'TB7 2QE'], ['code K9Z 4A7', 'K9Z 4A7']])(
    'flags the code in "%s" as a location', (phrase, code) => {
      expect(found(`The address ends ${phrase}.`).filter((f) => f[1] === code)).toEqual([['location', code]])
    })
})

describe('overlaps', () => {
  it('keeps the e-mail address over the name inside it, and sorts flags by start', () => {
    const flags = scanForIdentifiers('agnes.pellow@example.org wrote, then Agnes Pellow rang.', {
      studyTerms: [{ term: 'Agnes Pellow', category: 'name' }, { term: 'pellow', category: 'name' }] })
    expect(flags.map((f) => [f.category, f.text])).toEqual([['email', 'agnes.pellow@example.org'], ['name', 'Agnes Pellow']])
    expect(flags[0].start).toBe(0)
  })
})
