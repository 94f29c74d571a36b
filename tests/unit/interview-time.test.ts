import { describe, expect, it } from 'vitest'
import { LocalTimeError, isTimeZone, localToUtc, utcToLocal } from '../../shared/interviews/time.js'

/**
 * Daylight-saving rules from the IANA time zone database: in 2027 North America springs forward on
 * Sunday 14 March at 02:00 local time (second Sunday in March, US Energy Policy Act of 2005 rule) and
 * the European Union on Sunday 28 March at 01:00 UTC (last Sunday in March, Directive 2000/84/EC).
 * Between those dates Vancouver is on UTC−7 while London is still on UTC+0.
 */
describe('interview times across time zones', () => {
  it('converts a Vancouver wall-clock time to UTC on each side of the spring-forward change', () => {
    expect(localToUtc('2027-03-13T09:30', 'America/Vancouver')).toBe('2027-03-13T17:30:00Z') // PST, UTC−8
    expect(localToUtc('2027-03-14T09:30', 'America/Vancouver')).toBe('2027-03-14T16:30:00Z') // PDT, UTC−7
  })

  it('shows the same moment on both clocks while only one side has changed its clocks', () => {
    const utc = localToUtc('2027-03-20T09:00', 'America/Vancouver')
    expect(utcToLocal(utc, 'America/Vancouver').local).toBe('2027-03-20T09:00')
    expect(utcToLocal(utc, 'Europe/London').local).toBe('2027-03-20T16:00') // 7 hours apart that week
    const after = localToUtc('2027-04-03T09:00', 'America/Vancouver')
    expect(utcToLocal(after, 'Europe/London').local).toBe('2027-04-03T17:00') // 8 hours apart once London is on BST
  })

  it('refuses a time that does not exist because the clocks jump over it', () => {
    expect(() => localToUtc('2027-03-14T02:30', 'America/Vancouver')).toThrow(LocalTimeError)
    expect(() => localToUtc('2027-03-14T02:30', 'America/Vancouver')).toThrow(/clocks go forward/)
  })

  it('takes an ambiguous autumn time as its first occurrence (common practice)', () => {
    // 2027-11-07 01:30 happens twice in Vancouver; the earlier one is PDT (UTC−7)
    expect(localToUtc('2027-11-07T01:30', 'America/Vancouver')).toBe('2027-11-07T08:30:00Z')
  })

  it('works for zones with half-hour offsets and none at all', () => {
    expect(localToUtc('2027-06-01T12:00', 'Asia/Kolkata')).toBe('2027-06-01T06:30:00Z') // UTC+5:30, no DST
    expect(utcToLocal('2027-06-01T06:30:00Z', 'UTC').local).toBe('2027-06-01T06:30')
  })

  it('recognises IANA zone names', () => {
    expect(isTimeZone('America/Winnipeg')).toBe(true)
    expect(isTimeZone('Mars/Olympus_Mons')).toBe(false)
  })
})
