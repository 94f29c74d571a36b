import { DateTime } from 'luxon'

/**
 * Interview times: entered as a wall-clock time in one person's IANA time zone, stored in UTC, and
 * shown in both people's zones. Luxon applies each zone's daylight-saving rules (IANA tz database).
 */
export function isTimeZone(zone: string): boolean {
  return DateTime.now().setZone(zone).isValid
}

export class LocalTimeError extends Error {}

/** "2026-03-08T09:30" in `zone` → the UTC instant (ISO). A time skipped by a DST change is refused. */
export function localToUtc(local: string, zone: string): string {
  const dt = DateTime.fromISO(local, { zone })
  if (!dt.isValid) throw new LocalTimeError(`"${local}" in ${zone} is not a valid date and time.`)
  // Luxon moves a time inside a spring-forward gap; if the wall clock changed, it did not exist
  if (dt.toFormat("yyyy-MM-dd'T'HH:mm") !== local.slice(0, 16)) {
    throw new LocalTimeError(`${local.replace('T', ' ')} does not exist in ${zone}: the clocks go forward then. Choose another time.`)
  }
  // a time that happens twice (clocks go back) is taken at its first occurrence, as people expect
  const earlier = dt.minus({ hours: 1 })
  const chosen = earlier.toFormat("yyyy-MM-dd'T'HH:mm") === local.slice(0, 16) ? earlier : dt
  return chosen.toUTC().toISO({ suppressMilliseconds: true })!
}

/** The UTC instant as a wall-clock time in `zone`, with the zone's abbreviation or offset. */
export function utcToLocal(utc: string, zone: string): { local: string; offset: string; label: string } {
  const dt = DateTime.fromISO(utc, { zone: 'utc' }).setZone(zone)
  return { local: dt.toFormat("yyyy-MM-dd'T'HH:mm"), offset: dt.toFormat('ZZ'), label: dt.toFormat('ccc d LLL yyyy, HH:mm ZZZZ') }
}
