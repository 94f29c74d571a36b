import { useQuery } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { searchResponse, type SearchResponse } from '@shared/schemas/coding'
import { http, segment } from './http'

/** Full-text search across excerpts and transcripts, with filters; the answer is checked against the schema. */
export type SearchScope = 'all' | 'excerpts' | 'transcripts'
export interface SearchParams {
  q: string
  in: SearchScope
  codeId?: string | null
  coderId?: string | null
  transcriptId?: string | null
  /** `name=value`, e.g. `region=coast` */
  characteristic?: string | null
}

export const searchKeys = {
  root: (studyId: string) => ['studies', studyId, 'search'] as const,
  results: (studyId: string, params: SearchParams) =>
    ['studies', studyId, 'search', params.q, params.in, params.codeId ?? '', params.coderId ?? '', params.transcriptId ?? '', params.characteristic ?? ''] as const,
}

export const searchStudy = (studyId: string, params: SearchParams): Promise<SearchResponse> =>
  http.get(`/studies/${segment(studyId)}/search`, searchResponse, { ...params, q: params.q.trim() })

/** Runs only when there is something to look for. */
export function useSearchQuery(studyId: MaybeRefOrGetter<string>, params: MaybeRefOrGetter<SearchParams | null>) {
  return useQuery({
    key: () => searchKeys.results(toValue(studyId), toValue(params) ?? { q: '', in: 'all' }),
    query: () => searchStudy(toValue(studyId), toValue(params)!),
    enabled: () => Boolean(toValue(studyId) && toValue(params)?.q.trim()),
  })
}
