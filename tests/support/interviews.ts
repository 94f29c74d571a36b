import { ELIGIBLE_ANSWERS } from './recruitment.js'
import { approvedForm } from './consent.js'
import type { Client } from './test-app.js'

/** A consented participant (verbal consent on an approved form) ready for an interview. */
export async function consentedParticipant(coordinator: Client, lead: Client, studyId: string, name: string, email: string, clauses = { audio_recording: true, direct_quotes: true, future_contact: true }) {
  const created = await coordinator.post(`/api/studies/${studyId}/participants`, {
    contact: { name, email, phone: '', country: 'Canada', timeZone: 'America/Vancouver' },
    source: 'phone',
    answers: ELIGIBLE_ANSWERS,
  })
  let forms = (await lead.get(`/api/studies/${studyId}/consent-forms`)).body.forms as { id: string; status: string }[]
  if (!forms.some((f) => f.status === 'approved')) {
    await approvedForm(lead, studyId)
    forms = (await lead.get(`/api/studies/${studyId}/consent-forms`)).body.forms
  }
  const form = forms.find((f) => f.status === 'approved')!
  const res = await coordinator.post(`/api/studies/${studyId}/participants/${created.body.id}/consents`, { formId: form.id, clauses, signerName: name })
  if (res.status !== 201) throw new Error(`consent: ${res.status} ${JSON.stringify(res.body)}`)
  return created.body.id as string
}

export async function doneInterview(coordinator: Client, studyId: string, participantId: string, interviewerId: string) {
  const scheduled = await coordinator.post(`/api/studies/${studyId}/interviews`, {
    participantId,
    localTime: '2027-03-20T09:00',
    timeZoneOf: 'participant',
    participantTimeZone: 'America/Vancouver',
    interviewerId,
    interviewerTimeZone: 'Europe/London',
    mode: 'video',
    plannedMinutes: 60,
  })
  if (scheduled.status !== 201) throw new Error(`schedule: ${scheduled.status} ${JSON.stringify(scheduled.body)}`)
  const done = await coordinator.post(`/api/studies/${studyId}/interviews/${scheduled.body.id}/outcome`, { status: 'done', actualMinutes: 64, fieldNotes: 'Quiet room; participant relaxed.' })
  return done.body as { id: string; notesOnly: boolean }
}

export async function uploadTranscript(coordinator: Client, studyId: string, interviewId: string, buffer: Buffer, name = 'transcript.txt') {
  return coordinator.agent.post(`/api/studies/${studyId}/interviews/${interviewId}/transcripts`).set('X-CSRF-Token', coordinator.csrf).attach('file', buffer, name)
}

/** A consented, interviewed participant with an approved transcript of `text` (every flag accepted). */
export async function approvedTranscript(coordinator: Client, lead: Client, studyId: string, name: string, email: string, text: string, clauses?: Record<string, boolean>) {
  const participantId = await consentedParticipant(coordinator, lead, studyId, name, email, clauses as never)
  const interview = await doneInterview(coordinator, studyId, participantId, (await coordinator.get('/api/auth/me')).body.user.id)
  const up = await uploadTranscript(coordinator, studyId, interview.id, Buffer.from(text, 'utf8'))
  if (up.status !== 201) throw new Error(`upload: ${up.status} ${JSON.stringify(up.body)}`)
  const review = (await coordinator.get(`/api/studies/${studyId}/transcripts/${up.body.id}/deidentification`)).body
  await coordinator.put(`/api/studies/${studyId}/transcripts/${up.body.id}/deidentification`, { decisions: review.flags.map((f: { id: string }) => ({ id: f.id, decision: 'rejected' })) })
  const approved = await coordinator.post(`/api/studies/${studyId}/transcripts/${up.body.id}/approve`)
  if (approved.status !== 200) throw new Error(`approve: ${approved.status} ${JSON.stringify(approved.body)}`)
  return { participantId, transcriptId: up.body.id as string }
}
