import { describe, expect, it } from 'vitest'
import { recruitmentFlow, type FlowPerson } from '../../shared/reports/flow.js'
import { flowReport } from '../../shared/schemas/reports.js'

const HELP_SEEKING = 'Looking for help with their own care'
const TOO_LONG_AGO = 'Stroke more than a year before discharge'

const base: FlowPerson = { status: 'enquired', screened: false, everEligible: false, consented: false, interviewed: false, withdrawn: false, exitReason: null }
const p = (over: Partial<FlowPerson>): FlowPerson => ({ ...base, ...over })
const screened = { screened: true }
const eligible = { screened: true, everEligible: true }
const consented = { ...eligible, consented: true }

/*
 * Hand-counted fixture (invented, demo scenario), 12 people:
 *   P1, P2   enquired, not screened                              → exit after enquired: Not screened yet (2)
 *   P3       screening, not decided                               → exit after screened: Awaiting review (1)
 *   P4, P5   not eligible: looking for help with their own care   → exit after screened (2)
 *   P6       not eligible: stroke too long ago                    → exit after screened (1)
 *   P7       eligible, not consented                              → exit after eligible: Not consented yet (1)
 *   P8       consented, not interviewed                           → exit after consented: Not interviewed yet (1)
 *   P9, P10  consented and interviewed                            → no exit
 *   P11      interviewed, then withdrew                           → Withdrew
 *   P12      consented, withdrew before the interview             → Withdrew (2 in all)
 * Stages: enquired 12; screened 10 (P3–P12); eligible 6 (P7–P12); consented 5 (P8–P12); interviewed 3 (P9–P11); withdrawn 2.
 */
const people: FlowPerson[] = [
  p({}),
  p({}),
  p({ status: 'screening', ...screened }),
  p({ status: 'not_eligible', ...screened, exitReason: HELP_SEEKING }),
  p({ status: 'not_eligible', ...screened, exitReason: HELP_SEEKING }),
  p({ status: 'not_eligible', ...screened, exitReason: TOO_LONG_AGO }),
  p({ status: 'eligible', ...eligible }),
  p({ status: 'consented', ...consented }),
  p({ status: 'consented', ...consented, interviewed: true }),
  p({ status: 'consented', ...consented, interviewed: true }),
  p({ status: 'withdrawn', ...consented, interviewed: true, withdrawn: true }),
  p({ status: 'withdrawn', ...consented, withdrawn: true }),
]

describe('recruitmentFlow (expected values hand-counted from the fixture above)', () => {
  const report = flowReport.parse(recruitmentFlow(people))

  it('counts everyone who reached each stage, in stage order', () => {
    expect(report.stages).toEqual([
      { key: 'enquired', label: 'Enquired', count: 12 },
      { key: 'screened', label: 'Screened', count: 10 },
      { key: 'eligible', label: 'Eligible', count: 6 },
      { key: 'consented', label: 'Consented', count: 5 },
      { key: 'interviewed', label: 'Interviewed', count: 3 },
      { key: 'withdrawn', label: 'Withdrawn', count: 2 },
    ])
  })

  it('lists exits by stage, then largest count first, then reason', () => {
    expect(report.exits).toEqual([
      { after: 'enquired', reason: 'Not screened yet', count: 2 },
      { after: 'screened', reason: HELP_SEEKING, count: 2 },
      { after: 'screened', reason: 'Awaiting review', count: 1 },
      { after: 'screened', reason: TOO_LONG_AGO, count: 1 },
      { after: 'eligible', reason: 'Not consented yet', count: 1 },
      { after: 'consented', reason: 'Not interviewed yet', count: 1 },
      { after: 'withdrawn', reason: 'Withdrew', count: 2 },
    ])
  })

  it('accounts for every person once: still taking part after an interview, or in one exit', () => {
    // 2 interviewed and not withdrawn (P9, P10) + 10 in exits = 12 enquired
    const inExits = report.exits.reduce((s, e) => s + e.count, 0)
    const stillIn = people.filter((x) => x.interviewed && !x.withdrawn).length
    expect(stillIn + inExits).toBe(report.stages[0]!.count)
  })

  it('names a not-eligible person with no recorded reason "Not eligible"', () => {
    const r = recruitmentFlow([p({ status: 'not_eligible', ...screened }), p({ status: 'not_eligible', ...screened, exitReason: '  ' })])
    expect(r.exits).toEqual([{ after: 'screened', reason: 'Not eligible', count: 2 }])
  })

  it('is all zeros with no exits for a study nobody has contacted', () => {
    const r = recruitmentFlow([])
    expect(r.stages.map((s) => s.count)).toEqual([0, 0, 0, 0, 0, 0])
    expect(r.exits).toEqual([])
  })
})
