import { createEvent } from 'ics'
import { utcToLocal } from '../../../shared/interviews/time.js'
import type { MailDraft } from '../mail/mail.service.js'
import type { Interview } from './interview.entity.js'

const MODE_WORDS = { video: 'by video call', phone: 'by phone', in_person: 'in person' } as const

/**
 * An iCalendar (RFC 5545) event made by the `ics` package. The UID stays the same for an interview and
 * SEQUENCE goes up with each change, so calendar programs update or cancel the event they already have.
 */
export function calendarFile(interview: Interview, studyTitle: string, method: 'REQUEST' | 'CANCEL'): string {
  const start = interview.scheduledAt
  const { error, value } = createEvent({
    uid: `interview-${interview.id}@heardwell`,
    sequence: interview.calendarSequence,
    method,
    status: method === 'CANCEL' ? 'CANCELLED' : 'CONFIRMED',
    start: [start.getUTCFullYear(), start.getUTCMonth() + 1, start.getUTCDate(), start.getUTCHours(), start.getUTCMinutes()],
    startInputType: 'utc',
    startOutputType: 'utc',
    duration: { minutes: interview.plannedMinutes },
    title: `Research interview: ${studyTitle}`,
    description: `Interview for the study "${studyTitle}", ${MODE_WORDS[interview.mode]}. This is a research interview, not a care appointment.`,
    productId: 'heardwell/interviews',
  })
  if (error || !value) throw new Error(`calendar file could not be made: ${error?.message ?? 'unknown'}`)
  return value
}

export type InterviewMailKind = 'confirmation' | 'update' | 'cancellation' | 'reminder'

const SUBJECTS: Record<InterviewMailKind, string> = {
  confirmation: 'Your interview is booked',
  update: 'Your interview has changed',
  cancellation: 'Your interview is cancelled',
  reminder: 'Reminder: your interview is tomorrow',
}

/** An interview e-mail to one person, the time shown in their own zone; never any answers or notes. */
export function interviewMail(kind: InterviewMailKind, interview: Interview, to: { email: string; name: string; timeZone: string }, studyTitle: string): MailDraft {
  const when = utcToLocal(interview.scheduledAt.toISOString(), to.timeZone).label
  const lines = [`Hello ${to.name},`, '']
  if (kind === 'cancellation') lines.push(`The interview for the study "${studyTitle}" planned for ${when} (${to.timeZone}) is cancelled.`)
  else lines.push(`${kind === 'update' ? 'The new time for your interview' : 'Your interview'} for the study "${studyTitle}": ${when} (${to.timeZone}), ${MODE_WORDS[interview.mode]}, about ${interview.plannedMinutes} minutes.`)
  lines.push('', 'The attached calendar file adds it to your calendar. If the time no longer suits you, reply to the study team.', '', 'This is a research interview. It does not give medical advice or care.')
  return {
    to: to.email,
    subject: `${SUBJECTS[kind]}: ${studyTitle}`,
    body: lines.join('\n') + '\n',
    attachments: [{ filename: 'interview.ics', contentType: `text/calendar; charset=utf-8; method=${kind === 'cancellation' ? 'CANCEL' : 'REQUEST'}`, content: calendarFile(interview, studyTitle, kind === 'cancellation' ? 'CANCEL' : 'REQUEST') }],
  }
}
