import { FLOW_STAGES, type FlowReport } from '../schemas/reports.js'

export type FlowStage = (typeof FLOW_STAGES)[number]

/** One person who enquired, with what has happened to them so far. */
export interface FlowPerson {
  status: 'enquired' | 'screening' | 'eligible' | 'not_eligible' | 'consented' | 'withdrawn'
  screened: boolean
  everEligible: boolean
  consented: boolean
  interviewed: boolean
  withdrawn: boolean
  /** why screening found them not eligible (the failing criterion), when it did */
  exitReason: string | null
}

export const FLOW_STAGE_LABELS: Record<FlowStage, string> = {
  enquired: 'Enquired',
  screened: 'Screened',
  eligible: 'Eligible',
  consented: 'Consented',
  interviewed: 'Interviewed',
  withdrawn: 'Withdrawn',
}

export const EXIT_REASONS = {
  notScreened: 'Not screened yet',
  awaitingReview: 'Awaiting review',
  notEligible: 'Not eligible',
  notConsented: 'Not consented yet',
  notInterviewed: 'Not interviewed yet',
  withdrew: 'Withdrew',
} as const

/** The stage after which a person left (or is waiting), with the reason; null when they were interviewed. */
function exitOf(p: FlowPerson): { after: FlowStage; reason: string } | null {
  // a withdrawal is counted once, as a withdrawal, whatever stage it happened at (counts only, no reasons)
  if (p.withdrawn) return { after: 'withdrawn', reason: EXIT_REASONS.withdrew }
  if (!p.screened) return { after: 'enquired', reason: EXIT_REASONS.notScreened }
  if (!p.everEligible) {
    const fallback = p.status === 'not_eligible' ? EXIT_REASONS.notEligible : EXIT_REASONS.awaitingReview
    return { after: 'screened', reason: p.exitReason?.trim() || fallback }
  }
  if (!p.consented) return { after: 'eligible', reason: EXIT_REASONS.notConsented }
  if (!p.interviewed) return { after: 'consented', reason: EXIT_REASONS.notInterviewed }
  return null
}

/** The recruitment flow: how many people reached each stage, and why the others stopped where they did. */
export function recruitmentFlow(people: readonly FlowPerson[]): FlowReport {
  const reached: Record<FlowStage, (p: FlowPerson) => boolean> = {
    enquired: () => true,
    screened: (p) => p.screened,
    eligible: (p) => p.everEligible,
    consented: (p) => p.consented,
    interviewed: (p) => p.interviewed,
    withdrawn: (p) => p.withdrawn,
  }
  const stages = FLOW_STAGES.map((key) => ({ key, label: FLOW_STAGE_LABELS[key], count: people.filter(reached[key]).length }))

  const counts = new Map<string, { after: FlowStage; reason: string; count: number }>()
  for (const p of people) {
    const exit = exitOf(p)
    if (!exit) continue
    const id = `${exit.after}\u0000${exit.reason}`
    const entry = counts.get(id) ?? { ...exit, count: 0 }
    entry.count += 1
    counts.set(id, entry)
  }
  const order = (stage: FlowStage) => FLOW_STAGES.indexOf(stage)
  const exits = [...counts.values()].sort((a, b) => order(a.after) - order(b.after) || b.count - a.count || a.reason.localeCompare(b.reason))
  return { stages, exits }
}
