/**
 * Calendar dates as 'YYYY-MM-DD' strings, computed in UTC with no clock and no time zone, so a
 * screening gives the same answer on the client and the server.
 */
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/
const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December']

interface CalendarDate {
  year: number
  month: number // 1..12
  day: number
}

function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0
}

function daysInMonth(year: number, month: number): number {
  return [31, isLeapYear(year) ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][month - 1]
}

export function parseCalendarDate(text: string): CalendarDate | null {
  const match = ISO_DATE.exec(text)
  if (!match) return null
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])]
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null
  return { year, month, day }
}

export function isCalendarDate(text: string): boolean {
  return parseCalendarDate(text) !== null
}

function format({ year, month, day }: CalendarDate): string {
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`
}

/** '2024-02-29' → '29 February 2024': unambiguous in any English-speaking country. */
export function describeDate(text: string): string {
  const date = parseCalendarDate(text)
  return date ? `${date.day} ${MONTHS[date.month - 1]} ${date.year}` : text
}

/**
 * The date `amount` days, months or years before `date`. Months and years are calendar months and
 * years; when the day does not exist in the target month (31 March minus 1 month, 29 February minus
 * 1 year) it is clamped to that month's last day — common practice for date arithmetic.
 */
export function subtractPeriod(date: string, amount: number, unit: 'days' | 'months' | 'years'): string {
  const from = parseCalendarDate(date)
  if (!from) throw new RangeError(`Not a calendar date: ${date}`)
  if (unit === 'days') {
    const d = new Date(0)
    // setUTCFullYear, unlike Date.UTC, does not map years 0..99 onto 1900..1999.
    d.setUTCFullYear(from.year, from.month - 1, from.day - amount)
    return format({ year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate() })
  }
  const months = from.year * 12 + (from.month - 1) - (unit === 'years' ? amount * 12 : amount)
  const year = Math.floor(months / 12)
  const month = months - year * 12 + 1
  return format({ year, month, day: Math.min(from.day, daysInMonth(year, month)) })
}
