const DAY_MS = 24 * 60 * 60 * 1000

/** Dates as the viewer reads them: stored in UTC, shown in the viewer's own time zone. */
export function useDateFormat() {
  const dateFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' })
  // Calendar dates (YYYY-MM-DD, e.g. an approval date) have no time: show them as written.
  const calendarFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'UTC' })
  const dateTimeFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' })
  const zone = Intl.DateTimeFormat().resolvedOptions().timeZone

  const isCalendarDate = (value: string) => /^\d{4}-\d{2}-\d{2}$/.test(value)

  function date(value: string | null | undefined): string {
    if (!value) return '—'
    const parsed = new Date(value)
    if (Number.isNaN(parsed.getTime())) return value
    return (isCalendarDate(value) ? calendarFormat : dateFormat).format(parsed)
  }

  function dateTime(value: string | null | undefined): string {
    if (!value) return '—'
    const parsed = new Date(value)
    return Number.isNaN(parsed.getTime()) ? value : dateTimeFormat.format(parsed)
  }

  /** Whole days from today (in the viewer's zone) to a calendar date; negative when it has passed. */
  function daysUntil(value: string | null | undefined, today = new Date()): number | null {
    if (!value) return null
    const [y, m, d] = value.slice(0, 10).split('-').map(Number)
    const target = Date.UTC(y, m - 1, d)
    const now = Date.UTC(today.getFullYear(), today.getMonth(), today.getDate())
    return Math.round((target - now) / DAY_MS)
  }

  return { date, dateTime, daysUntil, zone }
}
