import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { z } from 'zod'
import {
  questionnaireSchema,
  recruitmentSettings,
  recruitmentSummary,
  type Questionnaire,
  type QuestionnaireInput,
  type RecruitmentSettings,
  type RecruitmentSettingsUpdate,
  type RecruitmentSummary,
} from '@shared/schemas/recruitment'
import { ApiError } from './errors'
import { http, segment } from './http'

/** A study's recruitment: its settings, the screening questionnaire and its versions, and the counts. */
export const recruitmentKeys = {
  root: (studyId: string) => ['studies', studyId, 'recruitment'] as const,
  settings: (studyId: string) => ['studies', studyId, 'recruitment', 'settings'] as const,
  summary: (studyId: string) => ['studies', studyId, 'recruitment', 'summary'] as const,
  form: (studyId: string) => ['studies', studyId, 'recruitment', 'screening-form'] as const,
  versions: (studyId: string) => ['studies', studyId, 'recruitment', 'screening-form', 'versions'] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`
const versionList = z.object({ versions: z.array(questionnaireSchema) })

export const fetchRecruitmentSettings = (studyId: string): Promise<RecruitmentSettings> =>
  http.get(`${base(studyId)}/recruitment-settings`, recruitmentSettings)
export const updateRecruitmentSettings = (studyId: string, body: RecruitmentSettingsUpdate): Promise<RecruitmentSettings> =>
  http.patch(`${base(studyId)}/recruitment-settings`, body, recruitmentSettings)
export const fetchRecruitmentSummary = (studyId: string): Promise<RecruitmentSummary> =>
  http.get(`${base(studyId)}/recruitment/summary`, recruitmentSummary)

/** The current questionnaire, or null while the study has none yet (the server answers 404). */
export async function fetchScreeningForm(studyId: string): Promise<Questionnaire | null> {
  try {
    return await http.get(`${base(studyId)}/screening-form`, questionnaireSchema)
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) return null
    throw error
  }
}
export const listScreeningFormVersions = async (studyId: string): Promise<Questionnaire[]> =>
  (await http.get(`${base(studyId)}/screening-form/versions`, versionList)).versions
export const saveScreeningForm = (studyId: string, body: QuestionnaireInput): Promise<Questionnaire> =>
  http.put(`${base(studyId)}/screening-form`, body, questionnaireSchema)

/** CSV downloads are plain links (the browser saves the file), so they do not go through http.ts. */
export function screeningLogUrl(studyId: string, withContacts = false): string {
  return `/api${base(studyId)}/exports/screening-log.csv${withContacts ? '?contacts=true' : ''}`
}

export function useRecruitmentSettingsQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => recruitmentKeys.settings(toValue(studyId)),
    query: () => fetchRecruitmentSettings(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

export function useRecruitmentSummaryQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => recruitmentKeys.summary(toValue(studyId)),
    query: () => fetchRecruitmentSummary(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

export function useScreeningFormQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => recruitmentKeys.form(toValue(studyId)),
    query: () => fetchScreeningForm(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

export function useScreeningFormVersionsQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => recruitmentKeys.versions(toValue(studyId)),
    query: () => listScreeningFormVersions(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

function useInvalidateRecruitment(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () => queryCache.invalidateQueries({ key: recruitmentKeys.root(toValue(studyId)) })
}

export function useRecruitmentSettingsMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateRecruitment(studyId)
  return useMutation({
    mutation: (body: RecruitmentSettingsUpdate) => updateRecruitmentSettings(toValue(studyId), body),
    onSettled: invalidate,
  })
}

export function useScreeningFormMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateRecruitment(studyId)
  return useMutation({
    mutation: (body: QuestionnaireInput) => saveScreeningForm(toValue(studyId), body),
    onSettled: invalidate,
  })
}
