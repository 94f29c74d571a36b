import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  participantDetail,
  participantPage,
  type Answers,
  type OverrideRequest,
  type ParticipantDetail,
  type ParticipantListQuery,
  type ParticipantPage,
  type StaffEnquiry,
} from '@shared/schemas/recruitment'
import { http, segment } from './http'
import { recruitmentKeys } from './recruitment'

/** Participants of a study: the server-paged list, one record, and the screening actions on it. */
export interface ParticipantFilter {
  page: number
  pageSize: number
  status?: ParticipantListQuery['status']
  source?: ParticipantListQuery['source']
  search?: string
  sortBy?: ParticipantListQuery['sortBy']
  sortDesc?: boolean
}

/** The table's sort order, as v-data-table-server reports it. */
export interface ParticipantSort {
  key: string
  order?: boolean | 'asc' | 'desc'
}

export const participantKeys = {
  root: (studyId: string) => ['studies', studyId, 'participants'] as const,
  page: (studyId: string, filter: ParticipantFilter) => ['studies', studyId, 'participants', 'page', { ...filter }] as const,
  detail: (studyId: string, participantId: string) => ['studies', studyId, 'participants', participantId] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}/participants`

export const fetchParticipantPage = (studyId: string, filter: ParticipantFilter): Promise<ParticipantPage> =>
  http.get(base(studyId), participantPage, { ...filter })
export const fetchParticipant = (studyId: string, participantId: string): Promise<ParticipantDetail> =>
  http.get(`${base(studyId)}/${segment(participantId)}`, participantDetail)
export const logEnquiry = (studyId: string, body: StaffEnquiry): Promise<ParticipantDetail> => http.post(base(studyId), body, participantDetail)
export const screenAgain = (studyId: string, participantId: string, body: { answers: Answers; note: string }): Promise<ParticipantDetail> =>
  http.post(`${base(studyId)}/${segment(participantId)}/screenings`, body, participantDetail)
export const overrideOutcome = (studyId: string, participantId: string, body: OverrideRequest): Promise<ParticipantDetail> =>
  http.post(`${base(studyId)}/${segment(participantId)}/override`, body, participantDetail)

export function useParticipantPageQuery(studyId: MaybeRefOrGetter<string>, filter: MaybeRefOrGetter<ParticipantFilter>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => participantKeys.page(toValue(studyId), toValue(filter)),
    query: () => fetchParticipantPage(toValue(studyId), toValue(filter)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
    // Keep the previous page on screen while the next one loads.
    placeholderData: (previous: ParticipantPage | undefined) => previous,
  })
}

export function useParticipantQuery(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => participantKeys.detail(toValue(studyId), toValue(participantId)),
    query: () => fetchParticipant(toValue(studyId), toValue(participantId)),
    enabled: () => Boolean(toValue(studyId) && toValue(participantId)),
  })
}

/** A screening changes the list, the record and the dashboard counts. */
function useInvalidateParticipants(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () =>
    Promise.all([
      queryCache.invalidateQueries({ key: participantKeys.root(toValue(studyId)) }),
      queryCache.invalidateQueries({ key: recruitmentKeys.root(toValue(studyId)) }),
    ])
}

export function useEnquiryLogMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateParticipants(studyId)
  return useMutation({ mutation: (body: StaffEnquiry) => logEnquiry(toValue(studyId), body), onSettled: invalidate })
}

export function useScreenAgainMutation(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateParticipants(studyId)
  return useMutation({
    mutation: (body: { answers: Answers; note: string }) => screenAgain(toValue(studyId), toValue(participantId), body),
    onSettled: invalidate,
  })
}

export function useOutcomeOverrideMutation(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateParticipants(studyId)
  return useMutation({
    mutation: (body: OverrideRequest) => overrideOutcome(toValue(studyId), toValue(participantId), body),
    onSettled: invalidate,
  })
}
