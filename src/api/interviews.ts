import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { ref, toValue, type MaybeRefOrGetter } from 'vue'
import {
  interviewGuideList,
  interviewGuideSchema,
  interviewList,
  interviewSchema,
  transcriptSummary,
  type Interview,
  type InterviewGuide,
  type InterviewGuideCreate,
  type InterviewOutcome,
  type InterviewReschedule,
  type InterviewSchedule,
  type TranscriptSummary,
} from '@shared/schemas/interviews'
import { http, segment, type UploadProgress } from './http'
import { participantKeys } from './participants'

/** Interviews of a study, the interview guide versions, and a transcript's upload from a done interview. */
export const interviewKeys = {
  root: (studyId: string) => ['studies', studyId, 'interviews'] as const,
  list: (studyId: string, participantId: string | null) => ['studies', studyId, 'interviews', 'list', participantId ?? 'all'] as const,
  guides: (studyId: string) => ['studies', studyId, 'interview-guides'] as const,
}
/** The transcripts key lives here too, so an upload can refresh the list without a circular import. */
export const transcriptRootKey = (studyId: string) => ['studies', studyId, 'transcripts'] as const

const base = (studyId: string) => `/studies/${segment(studyId)}`

export const listInterviews = async (studyId: string, participantId?: string | null): Promise<Interview[]> =>
  (await http.get(`${base(studyId)}/interviews`, interviewList, { participantId })).interviews
export const scheduleInterview = (studyId: string, body: InterviewSchedule): Promise<Interview> =>
  http.post(`${base(studyId)}/interviews`, body, interviewSchema)
export const rescheduleInterview = (studyId: string, interviewId: string, body: InterviewReschedule): Promise<Interview> =>
  http.patch(`${base(studyId)}/interviews/${segment(interviewId)}`, body, interviewSchema)
export const recordOutcome = (studyId: string, interviewId: string, body: InterviewOutcome): Promise<Interview> =>
  http.post(`${base(studyId)}/interviews/${segment(interviewId)}/outcome`, body, interviewSchema)
export function uploadTranscript(studyId: string, interviewId: string, file: File, onProgress?: UploadProgress): Promise<TranscriptSummary> {
  const form = new FormData()
  form.append('file', file)
  return http.upload(`${base(studyId)}/interviews/${segment(interviewId)}/transcripts`, form, transcriptSummary, onProgress)
}
export const listGuides = async (studyId: string): Promise<InterviewGuide[]> =>
  (await http.get(`${base(studyId)}/interview-guides`, interviewGuideList)).guides
export function createGuide(studyId: string, metadata: InterviewGuideCreate, file: File, onProgress?: UploadProgress): Promise<InterviewGuide> {
  const form = new FormData()
  form.append('metadata', JSON.stringify(metadata))
  form.append('file', file)
  return http.upload(`${base(studyId)}/interview-guides`, form, interviewGuideSchema, onProgress)
}
/** The guide's file is a plain download link. */
export const guideFileUrl = (studyId: string, guideId: string): string => `/api${base(studyId)}/interview-guides/${segment(guideId)}/file`

/** All interviews of the study, or one participant's when `participantId` is given. */
export function useInterviewsQuery(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string | null> = null, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => interviewKeys.list(toValue(studyId), toValue(participantId)),
    query: () => listInterviews(toValue(studyId), toValue(participantId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

export function useGuidesQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => interviewKeys.guides(toValue(studyId)),
    query: () => listGuides(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

/** An interview changes the interview lists and the participant's record (its timeline). */
function useInvalidateInterviews(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () =>
    Promise.all([
      queryCache.invalidateQueries({ key: interviewKeys.root(toValue(studyId)) }),
      queryCache.invalidateQueries({ key: participantKeys.root(toValue(studyId)) }),
    ])
}

export function useScheduleMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateInterviews(studyId)
  return useMutation({ mutation: (body: InterviewSchedule) => scheduleInterview(toValue(studyId), body), onSettled: invalidate })
}

export function useRescheduleMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateInterviews(studyId)
  return useMutation({
    mutation: ({ interviewId, body }: { interviewId: string; body: InterviewReschedule }) => rescheduleInterview(toValue(studyId), interviewId, body),
    onSettled: invalidate,
  })
}

export function useOutcomeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateInterviews(studyId)
  return useMutation({
    mutation: ({ interviewId, body }: { interviewId: string; body: InterviewOutcome }) => recordOutcome(toValue(studyId), interviewId, body),
    onSettled: invalidate,
  })
}

/** Uploads a transcript; `progress` follows the file from 0 to 1 (null when nothing is going up). */
export function useTranscriptUploadMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  const progress = ref<number | null>(null)
  const mutation = useMutation({
    mutation: ({ interviewId, file }: { interviewId: string; file: File }) => {
      progress.value = 0
      return uploadTranscript(toValue(studyId), interviewId, file, (fraction) => (progress.value = fraction))
    },
    onSettled: () => {
      progress.value = null
      return Promise.all([
        queryCache.invalidateQueries({ key: interviewKeys.root(toValue(studyId)) }),
        queryCache.invalidateQueries({ key: transcriptRootKey(toValue(studyId)) }),
      ])
    },
  })
  return { ...mutation, progress }
}

export function useGuideCreateMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  const progress = ref<number | null>(null)
  const mutation = useMutation({
    mutation: ({ metadata, file }: { metadata: InterviewGuideCreate; file: File }) => {
      progress.value = 0
      return createGuide(toValue(studyId), metadata, file, (fraction) => (progress.value = fraction))
    },
    onSettled: () => {
      progress.value = null
      return queryCache.invalidateQueries({ key: interviewKeys.guides(toValue(studyId)) })
    },
  })
  return { ...mutation, progress }
}
