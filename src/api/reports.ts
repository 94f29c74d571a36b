import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  characteristicsReport,
  checklistReport,
  flowReport,
  methodsSummary,
  quotesReport,
  type ChecklistItemUpdate,
  type ChecklistName,
  type ChecklistReport,
  type ExportName,
} from '@shared/schemas/reports'
import { http, segment } from './http'

/**
 * Reports: participant characteristics (small cells suppressed), the recruitment flow, quotes by
 * theme, the reporting checklists and a methods summary. Each also downloads as CSV by a plain link.
 */
export const reportKeys = {
  root: (studyId: string) => ['studies', studyId, 'reports'] as const,
  characteristics: (studyId: string, minCell: number) => ['studies', studyId, 'reports', 'characteristics', minCell] as const,
  flow: (studyId: string) => ['studies', studyId, 'reports', 'recruitment-flow'] as const,
  quotes: (studyId: string) => ['studies', studyId, 'reports', 'quotes-by-theme'] as const,
  checklist: (studyId: string, name: ChecklistName) => ['studies', studyId, 'reports', 'checklists', name] as const,
  methods: (studyId: string) => ['studies', studyId, 'reports', 'methods-summary'] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}/reports`
const checklistPath = (studyId: string, name: ChecklistName) => `${base(studyId)}/checklists/${segment(name)}`

export const fetchCharacteristics = (studyId: string, minCell: number) => http.get(`${base(studyId)}/characteristics`, characteristicsReport, { minCell })
export const fetchFlow = (studyId: string) => http.get(`${base(studyId)}/recruitment-flow`, flowReport)
export const fetchQuotes = (studyId: string) => http.get(`${base(studyId)}/quotes-by-theme`, quotesReport)
export const fetchChecklist = (studyId: string, name: ChecklistName) => http.get(checklistPath(studyId, name), checklistReport)
export const fetchMethods = (studyId: string) => http.get(`${base(studyId)}/methods-summary`, methodsSummary)
export const updateChecklistItem = (studyId: string, name: ChecklistName, number: string, body: ChecklistItemUpdate): Promise<ChecklistReport> =>
  http.put(`${checklistPath(studyId, name)}/items/${segment(number)}`, body, checklistReport)

/** Where the browser downloads an export; the byte-order mark helps spreadsheet programs read UTF-8. */
export function exportCsvUrl(studyId: string, name: ExportName, options: { bom?: boolean; minCell?: number } = {}): string {
  const params = new URLSearchParams()
  if (options.bom) params.set('bom', '1')
  if (options.minCell !== undefined) params.set('minCell', String(options.minCell))
  const search = params.toString()
  return `/api/studies/${segment(studyId)}/exports/${name}.csv${search ? `?${search}` : ''}`
}

export function useCharacteristicsQuery(studyId: MaybeRefOrGetter<string>, minCell: MaybeRefOrGetter<number>) {
  return useQuery({
    key: () => reportKeys.characteristics(toValue(studyId), toValue(minCell)),
    query: () => fetchCharacteristics(toValue(studyId), toValue(minCell)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

export function useFlowQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({ key: () => reportKeys.flow(toValue(studyId)), query: () => fetchFlow(toValue(studyId)), enabled: () => Boolean(toValue(studyId)) })
}

export function useQuotesQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({ key: () => reportKeys.quotes(toValue(studyId)), query: () => fetchQuotes(toValue(studyId)), enabled: () => Boolean(toValue(studyId)) })
}

export function useChecklistQuery(studyId: MaybeRefOrGetter<string>, name: MaybeRefOrGetter<ChecklistName>) {
  return useQuery({
    key: () => reportKeys.checklist(toValue(studyId), toValue(name)),
    query: () => fetchChecklist(toValue(studyId), toValue(name)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

export function useMethodsQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({ key: () => reportKeys.methods(toValue(studyId)), query: () => fetchMethods(toValue(studyId)), enabled: () => Boolean(toValue(studyId)) })
}

/** Saves one checklist item; the answer is the whole checklist, shown at once (progress included). */
export function useUpdateChecklistItemMutation(studyId: MaybeRefOrGetter<string>, name: MaybeRefOrGetter<ChecklistName>) {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: ({ number, body }: { number: string; body: ChecklistItemUpdate }) => updateChecklistItem(toValue(studyId), toValue(name), number, body),
    onSuccess: (report: ChecklistReport) => queryCache.setQueryData(reportKeys.checklist(toValue(studyId), toValue(name)), report),
  })
}
