import type { ChecklistItem, ChecklistName, ChecklistReport } from '../schemas/reports.js'

/** An item of a reporting checklist: its published number, our short label and its domain. */
export interface ChecklistEntry {
  number: string
  label: string
  domain: string
}

/** What a team saved against one item: where in the manuscript it is reported, a note, and whether it is done. */
export interface ChecklistAnswer {
  number: string
  where: string
  note: string
  done: boolean
}

const COREQ_TEAM = 'Research team and reflexivity'
const COREQ_DESIGN = 'Study design'
const COREQ_ANALYSIS = 'Analysis and findings'

const coreqLabels = [
  'Who interviewed',
  "Interviewer's credentials",
  "Interviewer's occupation",
  "Interviewer's gender",
  "Interviewer's experience and training",
  'Prior relationship with participants',
  'What participants knew about the researcher',
  'Interviewer characteristics reported',
  'Methodological orientation',
  'Sampling',
  'How participants were approached',
  'Number of participants',
  'Non-participation and reasons',
  'Setting of data collection',
  'Others present',
  'Sample description',
  'Interview guide and pilot',
  'Repeat interviews',
  'Audio/visual recording',
  'Field notes',
  'Duration',
  'Saturation',
  'Transcripts returned',
  'Number of coders',
  'Coding tree',
  'Where themes came from',
  'Software',
  'Participant checking',
  'Quotations identified',
  'Data and findings consistent',
  'Major themes clear',
  'Minor themes and diverse cases',
]

/** COREQ: 32 items in three domains of 8, 15 and 9 (Tong, Sainsbury & Craig 2007). */
export const COREQ_ITEMS: readonly ChecklistEntry[] = coreqLabels.map((label, i) => ({
  number: String(i + 1),
  label,
  domain: i < 8 ? COREQ_TEAM : i < 23 ? COREQ_DESIGN : COREQ_ANALYSIS,
}))

const srqrLabels = [
  'Title',
  'Abstract',
  'Problem',
  'Purpose or question',
  'Approach and paradigm',
  'Researcher characteristics and reflexivity',
  'Context',
  'Sampling strategy',
  'Ethics',
  'Data collection methods',
  'Instruments and technologies',
  'Units of study',
  'Data processing',
  'Data analysis',
  'Trustworthiness techniques',
  'Synthesis and interpretation',
  'Links to empirical data',
  'Integration with prior work',
  'Limitations',
  'Conflicts of interest',
  'Funding',
]

function srqrDomain(n: number): string {
  if (n <= 2) return 'Title and abstract'
  if (n <= 4) return 'Introduction'
  if (n <= 15) return 'Methods'
  if (n <= 17) return 'Results/findings'
  if (n <= 19) return 'Discussion'
  return 'Other'
}

/** SRQR: 21 items, numbered S1–S21 (O'Brien et al. 2014). */
export const SRQR_ITEMS: readonly ChecklistEntry[] = srqrLabels.map((label, i) => ({ number: `S${i + 1}`, label, domain: srqrDomain(i + 1) }))

export const CHECKLIST_INFO: Record<ChecklistName, { title: string; source: string }> = {
  coreq: {
    title: 'COREQ: consolidated criteria for reporting qualitative research',
    source: 'Tong, Sainsbury & Craig (2007), International Journal for Quality in Health Care 19(6):349–357',
  },
  srqr: {
    title: 'SRQR: standards for reporting qualitative research',
    source: "O'Brien et al. (2014), Academic Medicine 89(9):1245–1251",
  },
}

export const CHECKLIST_ITEMS: Record<ChecklistName, readonly ChecklistEntry[]> = { coreq: COREQ_ITEMS, srqr: SRQR_ITEMS }

/** Whether `number` is an item of the checklist (for refusing answers to items that do not exist). */
export function isChecklistItem(name: ChecklistName, number: string): boolean {
  return CHECKLIST_ITEMS[name].some((item) => item.number === number)
}

/** The checklist with the team's saved answers merged in; saved answers to unknown items are ignored. */
export function checklistReport(name: ChecklistName, saved: readonly ChecklistAnswer[]): ChecklistReport {
  const byNumber = new Map(saved.map((s) => [s.number, s]))
  const items: ChecklistItem[] = CHECKLIST_ITEMS[name].map((entry) => {
    const answer = byNumber.get(entry.number)
    return { ...entry, where: answer?.where ?? '', note: answer?.note ?? '', done: answer?.done ?? false }
  })
  return { name, ...CHECKLIST_INFO[name], items, done: items.filter((i) => i.done).length, total: items.length }
}
