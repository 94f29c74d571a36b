import { useQuery } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { coOccurrenceMatrix, codeParticipantMatrix, type CoOccurrenceMatrix, type CodeParticipantMatrix } from '@shared/schemas/coding'
import { http, segment } from './http'

/** The code matrices: excerpt counts per code and participant, and how often codes occur together. */
export type MatrixKind = 'code-participant' | 'co-occurrence'

export const matrixKeys = {
  root: (studyId: string) => ['studies', studyId, 'matrices'] as const,
  one: (studyId: string, kind: MatrixKind, coderId: string | null) => ['studies', studyId, 'matrices', kind, coderId ?? ''] as const,
}

const path = (studyId: string, kind: MatrixKind) => `/studies/${segment(studyId)}/matrices/${kind}`

export const fetchCodeParticipantMatrix = (studyId: string, coderId: string | null): Promise<CodeParticipantMatrix> =>
  http.get(path(studyId, 'code-participant'), codeParticipantMatrix, { coderId })
export const fetchCoOccurrenceMatrix = (studyId: string, coderId: string | null): Promise<CoOccurrenceMatrix> =>
  http.get(path(studyId, 'co-occurrence'), coOccurrenceMatrix, { coderId })

/** Where the browser downloads a matrix as CSV; the byte-order mark helps spreadsheet programs read UTF-8. */
export function matrixCsvUrl(studyId: string, kind: MatrixKind, options: { coderId?: string | null; bom?: boolean } = {}): string {
  const params = new URLSearchParams()
  if (options.coderId) params.set('coderId', options.coderId)
  if (options.bom) params.set('bom', '1')
  const search = params.toString()
  return `/api${path(studyId, kind)}.csv${search ? `?${search}` : ''}`
}

export function useCodeParticipantMatrixQuery(studyId: MaybeRefOrGetter<string>, coderId: MaybeRefOrGetter<string | null>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => matrixKeys.one(toValue(studyId), 'code-participant', toValue(coderId)),
    query: () => fetchCodeParticipantMatrix(toValue(studyId), toValue(coderId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

export function useCoOccurrenceMatrixQuery(studyId: MaybeRefOrGetter<string>, coderId: MaybeRefOrGetter<string | null>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => matrixKeys.one(toValue(studyId), 'co-occurrence', toValue(coderId)),
    query: () => fetchCoOccurrenceMatrix(toValue(studyId), toValue(coderId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}
