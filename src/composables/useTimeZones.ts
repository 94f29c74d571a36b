import { LocalTimeError, localToUtc, utcToLocal } from '@shared/interviews/time'

/** The browser's own zone: the interviewer's default, since the interviewer is usually the one booking. */
export const browserZone = (): string => Intl.DateTimeFormat().resolvedOptions().timeZone

/** Every IANA zone the browser knows, plus any zone already in use (some engines list only canonical names). */
export function zoneChoices(...inUse: (string | null | undefined)[]): string[] {
  const known = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('timeZone') : []
  return [...new Set([...known, ...inUse.filter((z): z is string => Boolean(z))])].sort()
}

export interface BothClocks {
  utc: string
  participant: string
  interviewer: string
}

/**
 * One wall-clock time in one person's zone, shown on both people's clocks. Returns an error sentence
 * when the time does not exist there (the clocks go forward) or the input is not a full date and time.
 */
export function bothClocks(local: string, zoneOf: 'participant' | 'interviewer', participantZone: string, interviewerZone: string): BothClocks | { error: string } | null {
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/.test(local) || !participantZone || !interviewerZone) return null
  try {
    const utc = localToUtc(local.slice(0, 16), zoneOf === 'participant' ? participantZone : interviewerZone)
    return { utc, participant: utcToLocal(utc, participantZone).label, interviewer: utcToLocal(utc, interviewerZone).label }
  } catch (error) {
    if (error instanceof LocalTimeError) return { error: error.message }
    return { error: 'Choose a time zone from the list.' }
  }
}

/** How an interview reads in one person's zone: "Sat 20 Mar 2027, 09:00 PDT". */
export const clockIn = (utc: string, zone: string): string => utcToLocal(utc, zone).label
export const localInputIn = (utc: string, zone: string): string => utcToLocal(utc, zone).local
