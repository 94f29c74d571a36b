import { randomUUID } from 'node:crypto'
import { In, type EntityManager } from 'typeorm'
import { Interview } from '../modules/interviews/interview.entity.js'
import { Participant } from '../modules/recruitment/participant.entity.js'
import { TranscriptTurn } from '../modules/transcripts/transcript-turn.entity.js'
import { Transcript } from '../modules/transcripts/transcript.entity.js'
import type { Study } from '../modules/studies/study.entity.js'
import type { ObjectStore } from '../storage/object-store.js'

/**
 * Invented, already de-identified interviews for the demo study: each caregiver answers the same six
 * guide questions with answers drawn from the themes the study is about. Every word is invented.
 */
export const QUESTIONS = [
  'Thank you for talking with me. Could you tell me about the day your relative came home from hospital?',
  'What information did you get about medicines and follow-up?',
  'How did things go in the first weeks at home?',
  'Who helped you, and who did you wish had helped?',
  'How has looking after them affected you?',
  'Looking back, what do you wish you had known at discharge?',
]

export const ANSWERS: string[][] = [
  [
    'It was a Friday afternoon and everything happened in a rush. The nurse handed us a bag of tablets and a folder and said the taxi was waiting.',
    'We waited most of the day for the pharmacy. By the time [NAME-1] was allowed to leave it was dark and we were both exhausted.',
    'Honestly it felt like being pushed out of the door. One minute there were people everywhere and the next it was just us in the car park.',
  ],
  [
    'Nobody sat down with us about the medicines. There was a sheet with nine names on it and I had no idea which ones mattered most.',
    'The blood thinner worried me more than anything. I kept asking what to do if he missed a dose and got three different answers.',
    'We were told someone would ring about a clinic appointment. The call came five weeks later, after I had phoned [PLACE-1] four times.',
  ],
  [
    'The first week was the hardest. The stairs, the bathroom, getting up in the night. I did not sleep properly for a month.',
    'The occupational therapist came on day three and that changed everything. A rail by the toilet, a chair for the shower, small things.',
    'I was frightened of every headache and every slurred word. I did not know what was normal after a stroke and what meant ring an ambulance.',
  ],
  [
    'My sister drove over at weekends and the neighbours were wonderful. The formal help took weeks to arrive.',
    'I wish there had been one person to call. Instead it was the surgery, the hospital, the council, and everyone said it was someone else.',
    'The stroke nurse gave me her number and she actually answered. That one phone number was worth more than the whole folder.',
  ],
  [
    'I gave up my shifts at work. Money got tight and I felt guilty for even thinking about money.',
    'I lost myself a bit. Everything was about his appointments and his tablets and I stopped seeing my friends.',
    'Some days I was angry, and then ashamed of being angry. Nobody asks the carer how they are doing.',
  ],
  [
    'That recovery is slow and that tiredness is part of it. I thought he was giving up when really his brain was healing.',
    'I wish someone had told us what to watch for, in plain words, on one page, and who to call at night.',
    'That it is all right to ask for help, and that a carer needs a break too. I would have asked for respite much sooner.',
  ],
]

export const INTERVIEWED = ['P01', 'P02', 'P03', 'P06', 'P08', 'P14', 'P15', 'P16', 'P17', 'P18', 'P19', 'P20', 'P21']
const INTERVIEWERS: { role: 'coordinator' | 'lead'; zone: string }[] = [
  { role: 'coordinator', zone: 'America/Toronto' },
  { role: 'lead', zone: 'Europe/London' },
]

export function transcriptFor(index: number): { text: string; turns: { speaker: string; start: number; end: number; startMs: number }[] } {
  const parts: string[] = []
  const turns: { speaker: string; start: number; end: number; startMs: number }[] = []
  let offset = 0
  let ms = 4000
  QUESTIONS.forEach((question, q) => {
    const answer = ANSWERS[q]![(index + q) % ANSWERS[q]!.length]!
    for (const [speaker, words] of [['Interviewer', question], ['Participant', answer]] as const) {
      if (parts.length) offset += 2
      turns.push({ speaker, start: offset, end: offset + words.length, startMs: ms })
      parts.push(words)
      offset += words.length
      ms += 25_000 + words.length * 400
    }
  })
  return { text: parts.join('\n\n'), turns }
}

export async function seedDemoInterviews(manager: EntityManager, study: Study, storage: ObjectStore, staff: Record<'coordinator' | 'lead', string>) {
  const participants = await manager.findBy(Participant, { studyId: study.id, pseudonym: In(INTERVIEWED) })
  const contacts: { participant_id: string; time_zone: string }[] = await manager.query('SELECT participant_id, time_zone FROM participant_contacts WHERE participant_id = ANY($1)', [participants.map((p) => p.id)])
  const zoneOf = new Map(contacts.map((c) => [c.participant_id, c.time_zone]))
  for (const [i, pseudonym] of INTERVIEWED.entries()) {
    const p = participants.find((x) => x.pseudonym === pseudonym)
    if (!p) continue
    const interviewer = INTERVIEWERS[i % INTERVIEWERS.length]!
    const when = new Date(Date.now() - (12 - (i % 12)) * 86_400_000)
    when.setUTCHours(17 + (i % 3), 0, 0, 0)
    const interview = await manager.save(
      manager.create(Interview, {
        studyId: study.id,
        participantId: p.id,
        scheduledAt: when,
        participantTimeZone: zoneOf.get(p.id) || 'America/Vancouver',
        interviewerId: staff[interviewer.role],
        interviewerTimeZone: interviewer.zone,
        mode: (['video', 'phone', 'in_person'] as const)[i % 3]!,
        plannedMinutes: 60,
        actualMinutes: 48 + ((i * 7) % 40),
        status: 'done',
        fieldNotes: 'Interview went well; the participant was open and reflective.',
      }),
    )
    const { text, turns } = transcriptFor(i)
    const id = randomUUID()
    const objectKey = `studies/${study.id}/transcripts/${id}/v1.txt`
    const stored = await storage.put(objectKey, Buffer.from(text, 'utf8'), 'text/plain; charset=utf-8')
    await manager.insert(Transcript, {
      id,
      studyId: study.id,
      interviewId: interview.id,
      participantId: p.id,
      version: 1,
      status: 'approved',
      format: 'text',
      wordCount: text.split(/\s+/).filter(Boolean).length,
      objectKey,
      sha256: stored.sha256,
      approvedById: staff.coordinator,
      approvedAt: when,
    })
    await manager.insert(TranscriptTurn, turns.map((t, position) => ({ transcriptId: id, position, speaker: t.speaker === 'Participant' ? pseudonym : t.speaker, startMs: t.startMs, start: t.start, end: t.end, text: text.slice(t.start, t.end) })))
  }
}
