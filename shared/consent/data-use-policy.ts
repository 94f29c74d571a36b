/**
 * THE one policy deciding what may be done with a participant's data. Every screen and service
 * asks this function rather than reading consent clauses itself.
 *
 * Clause keys it understands (see shared/schemas/consent.ts): audio_recording, direct_quotes,
 * future_contact. A clause counts as "yes" only when the form version asked it and the answer is
 * true; an unanswered clause is never read as permission.
 */
export interface DataUseInput {
  /** the consent in force (the newest record no later record corrects), or null */
  consent: { clauses: Record<string, boolean>; formClauses: { key: string; requiredForParticipation: boolean }[] } | null
  withdrawal: { scope: 'stop_keep_data' | 'withdraw_data'; dataRemoved: boolean } | null
}

export interface DataUse {
  mayCode: boolean
  mayQuote: boolean
  /** patient partners only ever see excerpts that may be quoted */
  mayShowPartners: boolean
  /** the interview may be taken down in notes only: no audio recording */
  notesOnly: boolean
  mayContactFuture: boolean
  /** one plain sentence for staff per thing not allowed (and for notes only) */
  reasons: string[]
}

const NOTHING: Omit<DataUse, 'reasons'> = { mayCode: false, mayQuote: false, mayShowPartners: false, notesOnly: false, mayContactFuture: false }

type Answer = 'yes' | 'no' | 'unanswered' | 'not_asked'

function answer(consent: NonNullable<DataUseInput['consent']>, key: string): Answer {
  if (!consent.formClauses.some((c) => c.key === key)) return 'not_asked'
  const value = consent.clauses[key]
  return value === true ? 'yes' : value === false ? 'no' : 'unanswered'
}

export function dataUsePolicy({ consent, withdrawal }: DataUseInput): DataUse {
  const blocking: string[] = []
  if (consent === null) {
    blocking.push('no consent on record')
  } else {
    for (const clause of consent.formClauses.filter((c) => c.requiredForParticipation)) {
      const given = consent.clauses[clause.key]
      if (given !== true) {
        const how = given === false ? 'declined' : 'has no answer for'
        blocking.push(`consent not valid: the participant ${how} "${clause.key}", which is required to take part`)
      }
    }
  }
  // GDPR Art. 7(3) and TCPS 2 Art. 3.1: once data are withdrawn nothing more is done with them.
  if (withdrawal?.dataRemoved) blocking.push('data withdrawn: the participant’s data have been removed from the study')
  if (consent === null || blocking.length > 0) return { ...NOTHING, reasons: blocking }

  const reasons: string[] = []
  const quotes = answer(consent, 'direct_quotes')
  // Common practice: quoting someone's words needs explicit permission, so a form that never asked allows none.
  const mayQuote = quotes === 'yes'
  if (quotes === 'no') reasons.push('no quotes: the participant declined to be quoted')
  if (quotes === 'unanswered') reasons.push('no quotes: there is no answer on record about quotes')
  if (quotes === 'not_asked') reasons.push('no quotes: the consent form did not ask for permission to quote')
  if (!mayQuote) reasons.push('not shown to patient partners: they only see excerpts that may be quoted')

  const audio = answer(consent, 'audio_recording')
  const notesOnly = audio === 'no' || audio === 'unanswered'
  if (notesOnly) reasons.push('notes only: the participant did not agree to audio recording')

  const contact = answer(consent, 'future_contact')
  const mayContactFuture = withdrawal === null && contact === 'yes'
  if (withdrawal !== null) reasons.push('no future contact: the participant has withdrawn from the study')
  else if (contact !== 'yes') reasons.push('no future contact: the participant did not agree to be contacted again')

  return { mayCode: true, mayQuote, mayShowPartners: mayQuote, notesOnly, mayContactFuture, reasons }
}
