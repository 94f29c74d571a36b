import type { EntityManager } from 'typeorm'
import { OKABE_ITO } from '../../shared/schemas/coding.js'
import { CodebookSnapshot } from '../modules/coding/codebook-snapshot.entity.js'
import { Code } from '../modules/coding/code.entity.js'
import { Excerpt, ExcerptCode } from '../modules/coding/excerpt.entity.js'
import { Memo } from '../modules/coding/memo.entity.js'
import type { Study } from '../modules/studies/study.entity.js'
import { INTERVIEWED, transcriptFor } from './demo-transcripts.js'

/**
 * The demo codebook (six groups, seventeen codes beneath them) and two coders' coding of the invented interviews.
 * The second coder codes fewer transcripts and reads a few codes differently on purpose, so the
 * agreement figures show some codes clearly weaker than others. Every word is invented.
 */
const CODEBOOK: { label: string; definition: string; children: [string, string, string?][] }[] = [
  { label: 'Leaving hospital', definition: 'The day of discharge and how it felt.', children: [
    ['Rushed discharge', 'Leaving in a hurry, with little explanation.', 'Use when the pace of leaving is the point. Not for waiting on the day.'],
    ['Waiting on the day', 'Delays on the day of discharge: pharmacy, transport, paperwork.'],
  ] },
  { label: 'Medicines and information', definition: 'What the family was told, and how.', children: [
    ['Unclear medicine instructions', 'Not knowing which medicines matter or how to take them.'],
    ['Conflicting advice', 'Different people saying different things.'],
    ['Follow-up delays', 'Appointments and calls that came late or not at all.'],
  ] },
  { label: 'First weeks at home', definition: 'Daily life in the first weeks after coming home.', children: [
    ['Stairs and bathroom', 'Moving around the house, personal care, getting up at night.'],
    ['Night-time worry', 'Fear of new symptoms; not knowing what is normal.', 'Use for fear of symptoms. Not for general tiredness of the carer.'],
    ['Home adaptations', 'Rails, chairs and other changes to the home, and who arranged them.'],
  ] },
  { label: 'Help and support', definition: 'Who helped, and who the family wished had helped.', children: [
    ['Family and neighbours', 'Informal help from relatives, friends and neighbours.'],
    ['One person to call', 'Wanting, or having, a single contact who answers.'],
    ['Formal help slow', 'Services that took weeks to arrive or passed the family around.'],
  ] },
  { label: 'Effect on the carer', definition: 'What caring did to the caregiver’s own life.', children: [
    ['Work and money', 'Lost shifts, income, worry about money.'],
    ['Losing myself', 'The carer’s own life shrinking around the patient’s needs.'],
    ['Anger and guilt', 'Anger, shame and guilt the carer felt.', 'Use for named feelings. Not for general low mood — use Losing myself.'],
  ] },
  { label: 'Looking back', definition: 'What they wish they had known at discharge.', children: [
    ['Recovery is slow', 'Understanding that recovery and tiredness take time.'],
    ['Plain-language information', 'Wanting information in plain words, on one page.'],
    ['Asking for help', 'Permission to ask for help and take breaks.'],
  ] },
]

/** The codes each invented answer carries: [question][answer] → labels. */
const ANSWER_CODES: string[][][] = [
  [['Rushed discharge', 'Unclear medicine instructions'], ['Waiting on the day'], ['Rushed discharge']],
  [['Unclear medicine instructions'], ['Conflicting advice', 'Unclear medicine instructions'], ['Follow-up delays', 'Formal help slow']],
  [['Stairs and bathroom'], ['Home adaptations'], ['Night-time worry']],
  [['Family and neighbours', 'Formal help slow'], ['One person to call', 'Formal help slow'], ['One person to call']],
  [['Work and money', 'Anger and guilt'], ['Losing myself'], ['Anger and guilt']],
  [['Recovery is slow'], ['Plain-language information', 'One person to call'], ['Asking for help']],
]

/** The second coder's readings: a few codes are read differently, most the same. */
function secondCoderCodes(labels: string[], transcript: number, question: number): string[] {
  return labels.flatMap((label) => {
    if (label === 'Anger and guilt' && transcript % 3 !== 0) return ['Losing myself']
    if (label === 'Night-time worry' && transcript % 2 === 0) return []
    if (label === 'One person to call' && question === 5) return ['Plain-language information']
    if (label === 'Waiting on the day') return ['Waiting on the day', 'Rushed discharge']
    return [label]
  })
}

const FIRST_CODER_TRANSCRIPTS = 9 // includes P08, who later withdrew their data: their excerpts are kept but never count
const SECOND_CODER_TRANSCRIPTS = 6

export async function seedDemoCoding(manager: EntityManager, study: Study, people: { lead: string; coder1: string; coder2: string }): Promise<void> {
  const codeId = new Map<string, string>()
  let colour = 0
  for (const [g, group] of CODEBOOK.entries()) {
    const parent = await manager.save(manager.create(Code, { studyId: study.id, position: g, label: group.label, definition: group.definition, colour: OKABE_ITO[colour++ % 8]!.hex }))
    codeId.set(group.label, parent.id)
    for (const [c, [label, definition, boundaries]] of group.children.entries()) {
      const [whenToUse, whenNotToUse] = (boundaries ?? '').split(' Not ').map((part, i) => (i === 1 ? `Not ${part}` : part))
      const code = await manager.save(manager.create(Code, { studyId: study.id, parentId: parent.id, position: c, label, definition, whenToUse: whenToUse ?? '', whenNotToUse: whenNotToUse ?? '', colour: OKABE_ITO[colour++ % 8]!.hex }))
      codeId.set(label, code.id)
    }
  }
  const transcripts: { id: string; participant_id: string; pseudonym: string }[] = await manager.query(
    `SELECT t.id, t.participant_id, p.pseudonym FROM transcripts t JOIN participants p ON p.id = t.participant_id WHERE t.study_id = $1 ORDER BY p.pseudonym`,
    [study.id],
  )
  const examples = new Map<string, string>()
  for (const t of transcripts) {
    const index = INTERVIEWED.indexOf(t.pseudonym)
    if (index < 0 || index >= FIRST_CODER_TRANSCRIPTS) continue
    const { text, turns } = transcriptFor(index)
    const answers = turns.filter((turn) => turn.speaker === 'Participant')
    for (const [q, turn] of answers.entries()) {
      const labels = ANSWER_CODES[q]![(index + q) % 3]!
      const firstSentence = turn.start + text.slice(turn.start, turn.end).indexOf('. ') + 1
      const coders: [string, string[], number][] = [[people.coder1, labels, turn.end]]
      if (index < SECOND_CODER_TRANSCRIPTS) coders.push([people.coder2, secondCoderCodes(labels, index, q), firstSentence > turn.start ? firstSentence : turn.end])
      for (const [coderId, codes, end] of coders) {
        if (!codes.length) continue
        const excerpt = await manager.save(manager.create(Excerpt, { studyId: study.id, transcriptId: t.id, participantId: t.participant_id, coderId, start: turn.start, end, text: text.slice(turn.start, end) }))
        await manager.insert(ExcerptCode, [...new Set(codes)].map((label) => ({ excerptId: excerpt.id, codeId: codeId.get(label)! })))
        for (const label of codes) if (coderId === people.coder1 && t.pseudonym !== 'P08' && !examples.has(label)) examples.set(label, excerpt.id)
      }
    }
  }
  for (const [label, excerptId] of examples) await manager.update(Code, { id: codeId.get(label)! }, { exampleExcerptId: excerptId })
  const codes = await manager.find(Code, { where: { studyId: study.id } })
  await manager.save(manager.create(CodebookSnapshot, {
    studyId: study.id,
    name: 'First draft after three interviews',
    createdById: people.coder1,
    createdByName: 'Priya Salden',
    codes: codes.filter((c) => c.label !== 'Asking for help').map((c) => ({ id: c.id, parentId: c.parentId, position: c.position, label: c.label === 'Losing myself' ? 'Loss of self' : c.label, definition: c.definition, whenToUse: c.whenToUse, whenNotToUse: c.whenNotToUse, colour: c.colour, status: c.status })),
  }))
  const first = transcripts.find((t) => t.pseudonym === 'P01')
  await manager.insert(Memo, [
    { studyId: study.id, targetType: 'study', targetId: null, authorId: people.lead, body: 'Coding meeting on Thursday: bring the three codes where you two read things differently (anger and guilt, night-time worry, one person to call).' },
    { studyId: study.id, targetType: 'code', targetId: codeId.get('Anger and guilt')!, authorId: people.coder2, body: 'I keep wanting to code these as Losing myself. Is anger a separate code, or part of the same loss?' },
    ...(first ? [{ studyId: study.id, targetType: 'transcript' as const, targetId: first.id, authorId: people.coder1, body: 'The rush on the day sets the tone for the whole interview. Compare with P03.' }] : []),
  ])
}
