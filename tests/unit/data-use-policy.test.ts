import { describe, expect, it } from 'vitest'
import { dataUsePolicy, type DataUse, type DataUseInput } from '../../shared/consent/index.js'

// Expected values follow the product's consent rules, not a published table: the design rules of
// the data-use policy, with GDPR Art. 7(3) and TCPS 2 Art. 3.1 for withdrawal as cited in the
// security reference (C.4, C.5). Quotes need explicit permission: common practice.
const form = (...keys: string[]) => [{ key: 'take_part', requiredForParticipation: true }, ...keys.map((key) => ({ key, requiredForParticipation: false }))]
const ALL = form('audio_recording', 'direct_quotes', 'future_contact')
const consent = (clauses: Record<string, boolean>, formClauses = ALL): DataUseInput['consent'] => ({ clauses: { take_part: true, ...clauses }, formClauses })
const yesToAll = consent({ audio_recording: true, direct_quotes: true, future_contact: true })

type Flags = Omit<DataUse, 'reasons'>
const flags = (mayCode: boolean, mayQuote: boolean, notesOnly: boolean, mayContactFuture: boolean): Flags => ({
  mayCode,
  mayQuote,
  mayShowPartners: mayQuote,
  notesOnly,
  mayContactFuture,
})
const NOTHING = flags(false, false, false, false)

const cases: [string, DataUseInput, Flags, RegExp | null][] = [
  ['allows everything when every clause is agreed', { consent: yesToAll, withdrawal: null }, flags(true, true, false, true), null],
  ['allows nothing without consent on record', { consent: null, withdrawal: null }, NOTHING, /no consent on record/],
  ['allows nothing when a required clause is declined', { consent: consent({ take_part: false, direct_quotes: true }), withdrawal: null }, NOTHING, /declined "take_part"/],
  ['allows nothing when a required clause has no answer', { consent: { clauses: { direct_quotes: true }, formClauses: ALL }, withdrawal: null }, NOTHING, /no answer for "take_part"/],
  ['allows coding but no quotes when quotes are declined', { consent: consent({ audio_recording: true, direct_quotes: false, future_contact: true }), withdrawal: null }, flags(true, false, false, true), /declined to be quoted/],
  ['allows no quotes when the form did not ask about them', { consent: consent({ audio_recording: true, future_contact: true }, form('audio_recording', 'future_contact')), withdrawal: null }, flags(true, false, false, true), /did not ask for permission to quote/],
  ['ignores a quote answer for a clause the form did not ask', { consent: consent({ direct_quotes: true }, form()), withdrawal: null }, flags(true, false, false, false), /did not ask for permission to quote/],
  ['takes notes only when audio recording is declined', { consent: consent({ audio_recording: false, direct_quotes: true, future_contact: true }), withdrawal: null }, flags(true, true, true, true), /notes only/],
  ['takes notes only when audio recording was asked but has no answer', { consent: consent({ direct_quotes: true, future_contact: true }), withdrawal: null }, flags(true, true, true, true), /notes only/],
  ['does not contact again when future contact is declined', { consent: consent({ audio_recording: true, direct_quotes: true, future_contact: false }), withdrawal: null }, flags(true, true, false, false), /did not agree to be contacted again/],
  ['keeps using data as consented but stops contact after a stop-keep-data withdrawal', { consent: yesToAll, withdrawal: { scope: 'stop_keep_data', dataRemoved: false } }, flags(true, true, false, false), /has withdrawn/],
  ['allows nothing once withdrawn data are removed', { consent: yesToAll, withdrawal: { scope: 'withdraw_data', dataRemoved: true } }, NOTHING, /data withdrawn/],
  ['keeps data kept after the deadline usable as consented, without contact', { consent: yesToAll, withdrawal: { scope: 'withdraw_data', dataRemoved: false } }, flags(true, true, false, false), /has withdrawn/],
  ['keeps quote limits for data kept after the deadline', { consent: consent({ audio_recording: true, direct_quotes: false, future_contact: true }), withdrawal: { scope: 'withdraw_data', dataRemoved: false } }, flags(true, false, false, false), /declined to be quoted/],
]

describe('data-use policy', () => {
  it.each(cases)('%s', (_name, input, expected, reason) => {
    const result = dataUsePolicy(input)
    expect(result).toMatchObject(expected)
    if (reason) expect(result.reasons.join('\n')).toMatch(reason)
    else expect(result.reasons).toEqual([])
  })

  it('shows patient partners only excerpts that may be quoted', () => {
    for (const [, input] of cases) {
      const result = dataUsePolicy(input)
      expect(result.mayShowPartners).toBe(result.mayQuote)
    }
  })

  it('gives a reason for each thing not allowed', () => {
    const result = dataUsePolicy({ consent: consent({ audio_recording: true, direct_quotes: false, future_contact: false }), withdrawal: null })
    expect(result.reasons).toHaveLength(3) // quotes, partners, future contact
    expect(dataUsePolicy({ consent: null, withdrawal: { scope: 'withdraw_data', dataRemoved: true } }).reasons).toEqual([
      'no consent on record',
      expect.stringMatching(/^data withdrawn/),
    ])
  })
})
