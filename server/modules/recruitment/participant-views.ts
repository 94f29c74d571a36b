import type { EligibilityResult, ParticipantDetail, ParticipantRow, ParticipantStatus } from '../../../shared/schemas/recruitment.js'
import type { ParticipantContact } from './participant-contact.entity.js'
import type { ParticipantEvent } from './participant-event.entity.js'
import type { Participant } from './participant.entity.js'
import type { ScreeningQuestionnaire } from './screening-questionnaire.entity.js'
import type { Screening } from './screening.entity.js'

/** P01 … P99, then P100 …: the study's running number, at least two digits. */
export function pseudonymFor(sequence: number): string {
  return `P${String(sequence).padStart(2, '0')}`
}

/** The participant's status after a screening (a result that needs a person stays "screening"). */
export function statusFor(result: EligibilityResult): ParticipantStatus {
  return result.outcome === 'eligible' ? 'eligible' : result.outcome === 'not_eligible' ? 'not_eligible' : 'screening'
}

/** The list row; contact details only when the caller may see them (lead and coordinators). */
export function toRow(p: Participant, contact: ParticipantContact | null | undefined): ParticipantRow {
  const row: ParticipantRow = {
    id: p.id,
    pseudonym: p.pseudonym,
    status: p.status,
    helpSeeking: p.helpSeeking,
    source: p.source,
    characteristics: p.characteristics,
    lastActivityAt: p.lastActivityAt.toISOString(),
  }
  if (contact) {
    row.contact = { name: contact.name, email: contact.email, phone: contact.phone, country: contact.country, timeZone: contact.timeZone }
  }
  return row
}

export function toDetail(
  p: Participant,
  contact: ParticipantContact | null,
  screenings: (Screening & { questionnaire: ScreeningQuestionnaire })[],
  events: ParticipantEvent[],
  names: Map<string, string>,
): ParticipantDetail {
  return {
    ...toRow(p, contact),
    sourceDetail: p.sourceDetail,
    override: p.override,
    screenings: screenings.map((s) => ({
      id: s.id,
      at: s.at.toISOString(),
      questionnaireVersion: s.questionnaire.version,
      answers: s.answers,
      result: s.result,
      screenedBy: s.screenedById ? (names.get(s.screenedById) ?? null) : null,
    })),
    timeline: events.map((e) => ({
      id: e.id,
      at: e.at.toISOString(),
      kind: e.kind,
      summary: e.summary,
      actor: e.actorName,
      details: e.details,
    })),
  }
}

const OUTCOME_WORDS = { eligible: 'eligible', not_eligible: 'not eligible', needs_review: 'needs a person to review' } as const
export function screeningSummary(result: EligibilityResult, version: number): string {
  const words = result.helpSeeking ? 'not enrolled: looking for help with their own care' : OUTCOME_WORDS[result.outcome]
  return `Screened with questionnaire version ${version}: ${words}`
}
