import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  codingSettings,
  excerptListResponse,
  excerptSchema,
  type CodingSettings,
  type Excerpt,
  type ExcerptCreate,
  type ExcerptList,
  type ExcerptUpdate,
} from '@shared/schemas/coding'
import { codebookKeys } from './codebook'
import { http, segment } from './http'

/**
 * Coding one transcript: a coder's excerpts (their own by default, another coder's when the study
 * allows comparison), adding, changing (each change carries the excerpt's version; a stale one
 * answers 409) and removing them, and the study's coding settings.
 */
export const codingKeys = {
  root: (studyId: string) => ['studies', studyId, 'coding'] as const,
  excerpts: (studyId: string, transcriptId: string) => ['studies', studyId, 'coding', 'excerpts', transcriptId] as const,
  mine: (studyId: string, transcriptId: string) => ['studies', studyId, 'coding', 'excerpts', transcriptId, 'mine'] as const,
  coder: (studyId: string, transcriptId: string, coderId: string) => ['studies', studyId, 'coding', 'excerpts', transcriptId, 'coder', coderId] as const,
  settings: (studyId: string) => ['studies', studyId, 'coding', 'settings'] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`
const excerptPath = (studyId: string, excerptId: string) => `${base(studyId)}/excerpts/${segment(excerptId)}`

export const fetchExcerpts = (studyId: string, transcriptId: string, coderId: string | null = null): Promise<ExcerptList> =>
  http.get(`${base(studyId)}/transcripts/${segment(transcriptId)}/excerpts`, excerptListResponse, { coderId })
export const createExcerpt = (studyId: string, transcriptId: string, body: ExcerptCreate): Promise<Excerpt> =>
  http.post(`${base(studyId)}/transcripts/${segment(transcriptId)}/excerpts`, body, excerptSchema)
export const updateExcerpt = (studyId: string, excerptId: string, body: ExcerptUpdate): Promise<Excerpt> => http.patch(excerptPath(studyId, excerptId), body, excerptSchema)
export const deleteExcerpt = async (studyId: string, excerptId: string, version: number): Promise<void> => {
  await http.delete(`${excerptPath(studyId, excerptId)}?version=${encodeURIComponent(String(version))}`)
}
export const fetchCodingSettings = (studyId: string): Promise<CodingSettings> => http.get(`${base(studyId)}/coding-settings`, codingSettings)
export const saveCodingSettings = (studyId: string, body: CodingSettings): Promise<CodingSettings> => http.put(`${base(studyId)}/coding-settings`, body, codingSettings)

/** Your own excerpts on a transcript, with the coders you may compare with. */
export function useExcerptsQuery(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => codingKeys.mine(toValue(studyId), toValue(transcriptId)),
    query: () => fetchExcerpts(toValue(studyId), toValue(transcriptId)),
    enabled: () => Boolean(toValue(studyId) && toValue(transcriptId)),
  })
}

/** Another coder's excerpts on a transcript, to compare (only asked for once a coder is chosen). */
export function useOtherCodingQuery(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>, coderId: MaybeRefOrGetter<string | null>) {
  return useQuery({
    key: () => codingKeys.coder(toValue(studyId), toValue(transcriptId), toValue(coderId) ?? ''),
    query: () => fetchExcerpts(toValue(studyId), toValue(transcriptId), toValue(coderId)),
    enabled: () => Boolean(toValue(studyId) && toValue(transcriptId) && toValue(coderId)),
  })
}

export function useCodingSettingsQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => codingKeys.settings(toValue(studyId)),
    query: () => fetchCodingSettings(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

/** Excerpts changed: this transcript's lists and the codebook's excerpt counts are out of date. */
export function useInvalidateExcerpts(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () =>
    Promise.all([
      queryCache.invalidateQueries({ key: codingKeys.excerpts(toValue(studyId), toValue(transcriptId)) }),
      queryCache.invalidateQueries({ key: codebookKeys.codes(toValue(studyId)) }),
    ])
}

export function useCreateExcerptMutation(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateExcerpts(studyId, transcriptId)
  return useMutation({ mutation: (body: ExcerptCreate) => createExcerpt(toValue(studyId), toValue(transcriptId), body), onSettled: invalidate })
}

export function useUpdateExcerptMutation(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateExcerpts(studyId, transcriptId)
  return useMutation({
    mutation: ({ excerptId, body }: { excerptId: string; body: ExcerptUpdate }) => updateExcerpt(toValue(studyId), excerptId, body),
    onSettled: invalidate,
  })
}

export function useDeleteExcerptMutation(studyId: MaybeRefOrGetter<string>, transcriptId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateExcerpts(studyId, transcriptId)
  return useMutation({
    mutation: ({ excerptId, version }: { excerptId: string; version: number }) => deleteExcerpt(toValue(studyId), excerptId, version),
    onSettled: invalidate,
  })
}

/** The lead switches comparison on or off: every coder's excerpt lists answer differently after. */
export function useCodingSettingsMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: (body: CodingSettings) => saveCodingSettings(toValue(studyId), body),
    onSettled: () => queryCache.invalidateQueries({ key: codingKeys.root(toValue(studyId)) }),
  })
}
