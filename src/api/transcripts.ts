import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  deidentificationTerms,
  type DeidentificationTerms,
  anonymisationLog,
  transcriptListResponse,
  transcriptReading,
  transcriptReview,
  transcriptSummary,
  type FlagDecisions,
  type TranscriptReading,
  type TranscriptReview,
  type TranscriptSummary,
} from '@shared/schemas/interviews'
import { http, segment } from './http'
import { interviewKeys, transcriptRootKey } from './interviews'

/**
 * Transcripts: the list, the approved reading text (what coders see), the identifiable review of one
 * still in review with its flag decisions, approval, rejection, and the anonymisation log.
 */
export const transcriptKeys = {
  root: transcriptRootKey,
  list: (studyId: string) => ['studies', studyId, 'transcripts', 'list'] as const,
  reading: (studyId: string, transcriptId: string) => ['studies', studyId, 'transcripts', transcriptId, 'reading'] as const,
  review: (studyId: string, transcriptId: string) => ['studies', studyId, 'transcripts', transcriptId, 'review'] as const,
  log: (studyId: string) => ['studies', studyId, 'anonymisation-log'] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`
const one = (studyId: string, transcriptId: string) => `${base(studyId)}/transcripts/${segment(transcriptId)}`

export const listTranscripts = async (studyId: string): Promise<TranscriptSummary[]> =>
  (await http.get(`${base(studyId)}/transcripts`, transcriptListResponse)).transcripts
export const fetchReading = (studyId: string, transcriptId: string): Promise<TranscriptReading> => http.get(one(studyId, transcriptId), transcriptReading)
export const fetchReview = (studyId: string, transcriptId: string): Promise<TranscriptReview> =>
  http.get(`${one(studyId, transcriptId)}/deidentification`, transcriptReview)
export const saveDecisions = (studyId: string, transcriptId: string, body: Partial<FlagDecisions>): Promise<TranscriptReview> =>
  http.put(`${one(studyId, transcriptId)}/deidentification`, { decisions: [], acceptEverywhere: [], manual: [], ...body }, transcriptReview)
export const approveTranscript = (studyId: string, transcriptId: string): Promise<TranscriptSummary> =>
  http.post(`${one(studyId, transcriptId)}/approve`, {}, transcriptSummary)
export const rejectTranscript = (studyId: string, transcriptId: string): Promise<TranscriptSummary> =>
  http.post(`${one(studyId, transcriptId)}/reject`, {}, transcriptSummary)
export const fetchAnonymisationLog = async (studyId: string) => (await http.get(`${base(studyId)}/anonymisation-log`, anonymisationLog)).entries

export function useTranscriptsQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => transcriptKeys.list(toValue(studyId)),
    query: () => listTranscripts(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

/** The approved, de-identified text. The reading view uses only this, never the review. */
export function useReadingQuery(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => transcriptKeys.reading(toValue(studyId), toValue(transcriptId)),
    query: () => fetchReading(toValue(studyId), toValue(transcriptId)),
    enabled: () => Boolean(toValue(studyId) && toValue(transcriptId)),
  })
}

export function useReviewQuery(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => transcriptKeys.review(toValue(studyId), toValue(transcriptId)),
    query: () => fetchReview(toValue(studyId), toValue(transcriptId)),
    enabled: () => Boolean(toValue(studyId) && toValue(transcriptId)),
    // Decisions are saved one by one; a refetch on focus would only race them.
    refetchOnWindowFocus: false,
  })
}

export function useAnonymisationLogQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => transcriptKeys.log(toValue(studyId)),
    query: () => fetchAnonymisationLog(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

/** Approving or rejecting closes the review: the lists, the interview counts and the log change. */
function useInvalidateTranscripts(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  // Not awaited: after approving, the review query refetches into "closed" (409), which must not turn
  // a successful approval into an error while the page moves on to the reading view.
  return () => {
    void Promise.all([
      queryCache.invalidateQueries({ key: transcriptKeys.root(toValue(studyId)) }),
      queryCache.invalidateQueries({ key: transcriptKeys.log(toValue(studyId)) }),
      queryCache.invalidateQueries({ key: interviewKeys.root(toValue(studyId)) }),
    ]).catch(() => {})
  }
}

export function useApproveMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateTranscripts(studyId)
  return useMutation({ mutation: (transcriptId: string) => approveTranscript(toValue(studyId), transcriptId), onSettled: invalidate })
}

export function useRejectMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateTranscripts(studyId)
  return useMutation({ mutation: (transcriptId: string) => rejectTranscript(toValue(studyId), transcriptId), onSettled: invalidate })
}

/** The team's own list of terms the de-identification scan always flags (lead and coordinators). */
const termsKey = (studyId: string) => ['studies', studyId, 'deidentification-terms'] as const

export function useDeidentificationTermsQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => termsKey(toValue(studyId)),
    query: () => http.get(`${base(toValue(studyId))}/deidentification-terms`, deidentificationTerms),
  })
}

export function useDeidentificationTermsMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: (body: DeidentificationTerms) => http.put(`${base(toValue(studyId))}/deidentification-terms`, body, deidentificationTerms),
    onSettled: () => queryCache.invalidateQueries({ key: termsKey(toValue(studyId)) }),
  })
}
