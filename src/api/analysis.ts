import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  agreementResponse,
  analysisSettings,
  saturationResponse,
  type AgreementResponse,
  type AnalysisSettings,
  type SaturationResponse,
} from '@shared/schemas/analysis'
import { http, segment } from './http'

/**
 * Analysis: the study's analysis settings (agreement on or off, its unit), inter-coder agreement for
 * the chosen coders, and the saturation assessment for the chosen parameters.
 */
export interface SaturationRequest {
  baseSize: number
  runLength: number
  /** a share from 0 to 1 */
  threshold: number
  coderId: string | null
}

export const analysisKeys = {
  root: (studyId: string) => ['studies', studyId, 'analysis'] as const,
  settings: (studyId: string) => ['studies', studyId, 'analysis', 'settings'] as const,
  agreementRoot: (studyId: string) => ['studies', studyId, 'analysis', 'agreement'] as const,
  agreement: (studyId: string, coderIds: readonly string[] | null) => ['studies', studyId, 'analysis', 'agreement', coderIds?.join(',') ?? ''] as const,
  saturation: (studyId: string, request: SaturationRequest) =>
    ['studies', studyId, 'analysis', 'saturation', request.baseSize, request.runLength, request.threshold, request.coderId ?? ''] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`

export const fetchAnalysisSettings = (studyId: string): Promise<AnalysisSettings> => http.get(`${base(studyId)}/analysis-settings`, analysisSettings)
export const saveAnalysisSettings = (studyId: string, body: AnalysisSettings): Promise<AnalysisSettings> =>
  http.put(`${base(studyId)}/analysis-settings`, body, analysisSettings)

/** The server reads `coderIds` repeated (`?coderIds=a&coderIds=b`), which the flat query helper cannot write. */
export function fetchAgreement(studyId: string, coderIds: readonly string[] | null): Promise<AgreementResponse> {
  const params = new URLSearchParams()
  for (const id of coderIds ?? []) params.append('coderIds', id)
  const search = params.toString()
  return http.get(`${base(studyId)}/agreement${search ? `?${search}` : ''}`, agreementResponse)
}

export const fetchSaturation = (studyId: string, request: SaturationRequest): Promise<SaturationResponse> =>
  http.get(`${base(studyId)}/saturation`, saturationResponse, {
    baseSize: request.baseSize,
    runLength: request.runLength,
    threshold: request.threshold,
    coderId: request.coderId,
  })

export function useAnalysisSettingsQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => analysisKeys.settings(toValue(studyId)),
    query: () => fetchAnalysisSettings(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

/** Switching agreement on or off, or changing its unit, changes every agreement answer. */
export function useAnalysisSettingsMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: (body: AnalysisSettings) => saveAnalysisSettings(toValue(studyId), body),
    onSuccess: (settings) => queryCache.setQueryData(analysisKeys.settings(toValue(studyId)), settings),
    onSettled: () => queryCache.invalidateQueries({ key: analysisKeys.agreementRoot(toValue(studyId)) }),
  })
}

/** `coderIds` null asks for the server's default: every coder who can be compared. */
export function useAgreementQuery(studyId: MaybeRefOrGetter<string>, coderIds: MaybeRefOrGetter<readonly string[] | null>) {
  return useQuery({
    key: () => analysisKeys.agreement(toValue(studyId), toValue(coderIds)),
    query: () => fetchAgreement(toValue(studyId), toValue(coderIds)),
    enabled: () => Boolean(toValue(studyId)),
    placeholderData: (previous: AgreementResponse | undefined) => previous,
  })
}

export function useSaturationQuery(studyId: MaybeRefOrGetter<string>, request: MaybeRefOrGetter<SaturationRequest>) {
  return useQuery({
    key: () => analysisKeys.saturation(toValue(studyId), toValue(request)),
    query: () => fetchSaturation(toValue(studyId), toValue(request)),
    enabled: () => Boolean(toValue(studyId)),
    placeholderData: (previous: SaturationResponse | undefined) => previous,
  })
}
