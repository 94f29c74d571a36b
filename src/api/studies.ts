import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { studyListResponse, studySchema, type Study, type StudyCreate, type StudyListResponse, type StudyUpdate } from '@shared/schemas/studies'
import { http, segment } from './http'

export const studyKeys = {
  root: ['studies'] as const,
  list: () => ['studies', 'list'] as const,
  detail: (studyId: string) => ['studies', studyId, 'detail'] as const,
}

export const listStudies = (): Promise<StudyListResponse> => http.get('/studies', studyListResponse)
export const fetchStudy = (studyId: string): Promise<Study> => http.get(`/studies/${segment(studyId)}`, studySchema)
export const createStudy = (body: StudyCreate): Promise<Study> => http.post('/studies', body, studySchema)
export const updateStudy = (studyId: string, body: StudyUpdate): Promise<Study> =>
  http.patch(`/studies/${segment(studyId)}`, body, studySchema)
export const assignStudyLead = async (studyId: string, email: string): Promise<void> => {
  await http.put(`/studies/${segment(studyId)}/lead`, { email })
}

export function useStudyListQuery() {
  return useQuery({ key: studyKeys.list(), query: listStudies })
}

export function useStudyQuery(studyId: MaybeRefOrGetter<string | undefined>) {
  return useQuery({
    key: () => studyKeys.detail(toValue(studyId) ?? ''),
    query: () => fetchStudy(toValue(studyId) ?? ''),
    enabled: () => Boolean(toValue(studyId)),
  })
}

function useInvalidateStudies() {
  const queryCache = useQueryCache()
  return () => queryCache.invalidateQueries({ key: studyKeys.root })
}

export function useStudyCreateMutation() {
  const invalidate = useInvalidateStudies()
  return useMutation({ mutation: (body: StudyCreate) => createStudy(body), onSettled: invalidate })
}

export function useStudyUpdateMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateStudies()
  return useMutation({ mutation: (body: StudyUpdate) => updateStudy(toValue(studyId), body), onSettled: invalidate })
}

export function useStudyLeadMutation() {
  const invalidate = useInvalidateStudies()
  return useMutation({
    mutation: ({ studyId, email }: { studyId: string; email: string }) => assignStudyLead(studyId, email),
    onSettled: invalidate,
  })
}
