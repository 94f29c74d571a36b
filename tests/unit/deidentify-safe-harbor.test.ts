import { describe, expect, it } from 'vitest'
import { RESTRICTED_ZIP3, safeHarborAge, safeHarborDate, safeHarborZip } from '../../shared/deidentify/index.js'

// Source for every expected value: HIPAA Safe Harbor, 45 CFR 164.514(b)(2)(i)(B)–(C), and HHS (2012),
// Guidance Regarding Methods for De-identification of PHI — as given in shared/reference/check-values.md §4.

describe('safeHarborZip — the 3-digit ZIP rule', () => {
  it.each([
    ['03601', '000'],
    ['89301', '000'],
    ['02139', '021'],
    ['10001', '100'],
    ['10201', '000'],
  ])('generalises %s to %s (worked examples, check-values §4)', (zip, expected) => {
    expect(safeHarborZip(zip)).toBe(expected)
  })

  it('lists exactly the 17 restricted prefixes of HHS (2012)', () => {
    expect([...RESTRICTED_ZIP3]).toEqual(['036', '059', '063', '102', '203', '556', '692', '790', '821', '823', '830', '831', '878', '879', '884', '890', '893'])
  })

  it.each(['036', '059', '063', '102', '203', '556', '692', '790', '821', '823', '830', '831', '878', '879', '884', '890', '893'])(
    'turns every ZIP starting %s into 000 (HHS 2012)', (prefix) => {
      expect(safeHarborZip(`${prefix}42`)).toBe('000')
      expect(safeHarborZip(`${prefix}42-1234`)).toBe('000')
    })

  it('keeps the prefix of a ZIP+4 code outside the list', () => {
    expect(safeHarborZip('02139-4307')).toBe('021') // 45 CFR 164.514(b)(2)(i)(B): first three digits
  })

  it('refuses text that is not a US ZIP code', () => {
    expect(() => safeHarborZip('QX4 7LN')).toThrow(RangeError)
    expect(() => safeHarborZip('1234')).toThrow(RangeError)
  })
})

describe('safeHarborAge — ages over 89', () => {
  it.each([
    [89, '89'],
    [90, '90 or older'],
    [103, '90 or older'],
  ])('gives %d as "%s" (check-values §4)', (age, expected) => {
    expect(safeHarborAge(age)).toBe(expected)
  })

  it('counts completed years, so 89.9 is still 89 (common practice)', () => {
    expect(safeHarborAge(89.9)).toBe('89')
  })

  it('refuses a negative or non-finite age', () => {
    expect(() => safeHarborAge(-1)).toThrow(RangeError)
    expect(() => safeHarborAge(Number.NaN)).toThrow(RangeError)
  })
})

describe('safeHarborDate — keep the year only', () => {
  it('gives 2021 for 2021-03-14 (check-values §4)', () => {
    expect(safeHarborDate('2021-03-14')).toBe('2021')
  })

  it('keeps the year of other written forms and of a Date', () => {
    expect(safeHarborDate('14/03/2021')).toBe('2021')
    expect(safeHarborDate('March 14, 2021')).toBe('2021')
    expect(safeHarborDate(new Date(Date.UTC(2021, 2, 14)))).toBe('2021')
  })

  it('refuses a date with no year in it', () => {
    expect(() => safeHarborDate('the 3rd of May')).toThrow(RangeError)
  })
})
