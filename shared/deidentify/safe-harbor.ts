// Generalising rules of HIPAA Safe Harbor, 45 CFR 164.514(b)(2)(i)(B) and (C), with the
// restricted ZIP prefixes from HHS (2012), Guidance Regarding Methods for De-identification of PHI.

/** 3-digit ZIP prefixes whose areas held 20,000 people or fewer in the 2000 Census (HHS 2012). */
export const RESTRICTED_ZIP3: readonly string[] = Object.freeze([
  '036', '059', '063', '102', '203', '556', '692', '790', '821',
  '823', '830', '831', '878', '879', '884', '890', '893',
])

/** First three digits of a US ZIP code (5 digits or ZIP+4), or '000' for a restricted prefix. */
export function safeHarborZip(zip: string): string {
  const match = /^\s*(\d{3})\d{2}(?:-?\d{4})?\s*$/.exec(zip)
  if (!match) throw new RangeError(`Not a US ZIP code: "${zip}"`)
  return RESTRICTED_ZIP3.includes(match[1]) ? '000' : match[1]
}

/** An age in whole years; every age over 89 is aggregated as "90 or older". */
export function safeHarborAge(age: number): string {
  if (!Number.isFinite(age) || age < 0) throw new RangeError(`Not an age: ${age}`)
  const years = Math.floor(age)
  return years > 89 ? '90 or older' : String(years)
}

/**
 * Keeps only the year of a date. Accepts a Date (its UTC year) or text holding a four-digit year
 * ("2021-03-14", "14/03/2021", "14 March 2021"). The rule also asks that a year revealing an age
 * over 89 (a birth year) be aggregated; that judgement is left to the reviewer.
 */
export function safeHarborDate(date: Date | string): string {
  if (date instanceof Date) {
    if (Number.isNaN(date.getTime())) throw new RangeError('Invalid date')
    return String(date.getUTCFullYear())
  }
  const year = /(?<!\d)(1\d{3}|2\d{3})(?!\d)/.exec(date)
  if (!year) throw new RangeError(`No year in "${date}"`)
  return year[1]
}
