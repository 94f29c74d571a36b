import type { EntityManager } from 'typeorm'
import { characteristicsFrom, evaluateEligibility } from '../../shared/eligibility/index.js'
import type { Answers, ReferralSource } from '../../shared/schemas/recruitment.js'
import { ParticipantContact } from '../modules/recruitment/participant-contact.entity.js'
import { ParticipantEvent } from '../modules/recruitment/participant-event.entity.js'
import { pseudonymFor, screeningSummary, statusFor } from '../modules/recruitment/participant-views.js'
import { Participant } from '../modules/recruitment/participant.entity.js'
import type { ScreeningQuestionnaire } from '../modules/recruitment/screening-questionnaire.entity.js'
import { Screening } from '../modules/recruitment/screening.entity.js'
import type { Study } from '../modules/studies/study.entity.js'

/** Invented enquirers for the demo study: a realistic mix of outcomes, sources, regions and time zones. */
interface DemoEnquirer {
  name: string
  zone: string
  source: ReferralSource
  daysAgo: number
  /** answers that differ from a typical eligible caregiver; null = logged by phone, not yet screened */
  answers: Partial<Answers> | null
}

const E = (name: string, zone: string, source: ReferralSource, daysAgo: number, answers: Partial<Answers> | null): DemoEnquirer => ({ name, zone, source, daysAgo, answers })

const ENQUIRERS: DemoEnquirer[] = [
  E('Marguerite Oyelaran', 'America/Edmonton', 'public_page', 88, { region: 'north', relationship: 'partner' }),
  E('Callum Dreyfuss', 'America/Vancouver', 'clinic_referral', 85, { region: 'coast', relationship: 'adult_child' }),
  E('Ines Valtonen', 'America/Winnipeg', 'public_page', 81, { region: 'valley', relationship: 'partner' }),
  E('Harold Pemberly', 'America/Edmonton', 'phone', 77, { region: 'north', relationship: 'partner', discharge_years_ago: 7 }),
  E('Noor Castellan', 'America/Vancouver', 'public_page', 74, { reason: 'help_for_myself', region: 'coast', relationship: 'other_family' }),
  E('Teodor Blaise', 'America/Edmonton', 'community_group', 70, { region: 'north', relationship: 'adult_child' }),
  E('Rosalind Achterberg', 'America/Toronto', 'public_page', 66, { region: 'elsewhere', relationship: 'adult_child' }),
  E('Sefa Mwangi-Holt', 'America/Vancouver', 'word_of_mouth', 61, { region: 'coast', relationship: 'partner' }),
  E('Agnieszka Farrow', 'America/Winnipeg', 'clinic_referral', 55, { region: 'valley', relationship: 'adult_child' }),
  E('Desmond Quayle', 'America/Vancouver', 'public_page', 49, { age: 17, region: 'coast', relationship: 'adult_child' }),
  E('Lucia Brandvold', 'America/Edmonton', 'public_page', 42, { region: 'north', relationship: 'partner' }),
  E('Pieter Ashgrove', 'America/Winnipeg', 'phone', 36, null),
  E('Yusra Delacroix', 'America/Vancouver', 'community_group', 33, { region: 'coast', relationship: 'adult_child', cared_after_stroke: null }),
  E('Bertil Oduya', 'America/Winnipeg', 'clinic_referral', 30, { region: 'valley', relationship: 'partner' }),
  E('Fenella Marchetti', 'America/Vancouver', 'public_page', 29, { region: 'coast', relationship: 'partner' }),
  E('Gwilym Asante', 'America/Edmonton', 'community_group', 28, { region: 'north', relationship: 'adult_child' }),
  E('Hanne Vasquez-Lund', 'America/Winnipeg', 'public_page', 26, { region: 'valley', relationship: 'adult_child' }),
  E('Oisin Ferreira', 'America/Vancouver', 'word_of_mouth', 24, { region: 'coast', relationship: 'other_family' }),
  E('Priya Lindqvist', 'America/Edmonton', 'clinic_referral', 22, { region: 'north', relationship: 'partner' }),
  E('Rafferty Nakamura', 'America/Winnipeg', 'phone', 20, { region: 'valley', relationship: 'partner' }),
  E('Solveig Adeyemi', 'America/Vancouver', 'public_page', 18, { region: 'coast', relationship: 'adult_child' }),
]

function isoDaysAgo(days: number, from = new Date()): Date {
  return new Date(from.getTime() - days * 86_400_000)
}

export async function seedDemoParticipants(manager: EntityManager, study: Study, questionnaire: ScreeningQuestionnaire, coordinatorId: string, coordinatorName: string) {
  let sequence = 0
  for (const person of ENQUIRERS) {
    sequence++
    const at = isoDaysAgo(person.daysAgo)
    const discharge = new Date(at)
    discharge.setUTCFullYear(discharge.getUTCFullYear() - Number(person.answers?.discharge_years_ago ?? 2))
    const answers: Answers | null = person.answers
      ? Object.fromEntries(
          Object.entries({
            reason: 'take_part',
            age: 40 + ((sequence * 7) % 35),
            cared_after_stroke: 'yes',
            discharge_date: discharge.toISOString().slice(0, 10),
            relationship: 'partner',
            anything_else: '',
            ...person.answers,
          }).filter(([k, v]) => k !== 'discharge_years_ago' && v !== null),
        ) as Answers
      : null
    const result = answers ? evaluateEligibility(questionnaire, answers, at.toISOString().slice(0, 10)) : null
    const staff = person.source !== 'public_page'
    const participant = await manager.save(
      manager.create(Participant, {
        studyId: study.id,
        sequence,
        pseudonym: pseudonymFor(sequence),
        status: result ? statusFor(result) : 'enquired',
        helpSeeking: result?.helpSeeking ?? false,
        source: person.source,
        sourceDetail: person.source === 'clinic_referral' ? 'Stroke unit discharge nurse' : '',
        characteristics: answers ? characteristicsFrom(questionnaire, answers) : {},
        lastActivityAt: at,
        createdAt: at,
      }),
    )
    const first = person.name.split(' ')[0]!.toLowerCase()
    await manager.insert(ParticipantContact, {
      participantId: participant.id,
      name: person.name,
      email: `${first}.${sequence}@example.org`,
      phone: staff ? `+1 555 01${String(sequence).padStart(2, '0')}` : '',
      country: 'Canada',
      timeZone: person.zone,
      consentToContact: true,
    })
    const actor = staff ? { actorId: coordinatorId, actorName: coordinatorName } : { actorId: null, actorName: null }
    await manager.insert(ParticipantEvent, { studyId: study.id, participantId: participant.id, kind: 'enquiry', summary: staff ? `Enquired by ${person.source.replace(/_/g, ' ')}` : 'Enquired on the public study page', at, details: {}, ...actor })
    if (answers && result) {
      await manager.insert(Screening, { participantId: participant.id, questionnaireId: questionnaire.id, answers, result, screenedById: staff ? coordinatorId : null, at })
      await manager.insert(ParticipantEvent, { studyId: study.id, participantId: participant.id, kind: 'screening', summary: screeningSummary(result, questionnaire.version), at, details: { outcome: result.outcome }, ...actor })
    }
  }
  await manager.update('studies', { id: study.id }, { participantSequence: sequence })
}
