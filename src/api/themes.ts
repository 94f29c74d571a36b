import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  partnerRound,
  partnerRoundListResponse,
  partnerTheme,
  roundDetail,
  roundListResponse,
  themeListResponse,
  themeSchema,
  type PartnerAnswerInput,
  type PartnerRound,
  type PartnerTheme,
  type RoundCreate,
  type RoundDetail,
  type RoundSummary,
  type Theme,
  type ThemeCreate,
  type ThemeOrder,
  type ThemeUpdate,
} from '@shared/schemas/themes'
import { fetchCodeExcerpts } from './codebook'
import { http, segment } from './http'

/**
 * Themes (each change carries the theme's version; a stale one answers 409), the review rounds the
 * lead opens for patient partners, and the partners' own side of a round.
 */
export const themeKeys = {
  root: (studyId: string) => ['studies', studyId, 'themes'] as const,
  rounds: (studyId: string) => ['studies', studyId, 'review-rounds'] as const,
  round: (studyId: string, roundId: string) => ['studies', studyId, 'review-rounds', roundId] as const,
  partnerRounds: (studyId: string) => ['studies', studyId, 'partner-rounds'] as const,
  partnerRound: (studyId: string, roundId: string) => ['studies', studyId, 'partner-rounds', roundId] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`
const themePath = (studyId: string, themeId: string) => `${base(studyId)}/themes/${segment(themeId)}`
const roundPath = (studyId: string, roundId: string) => `${base(studyId)}/review-rounds/${segment(roundId)}`
const partnerRoundPath = (studyId: string, roundId: string) => `${base(studyId)}/partner/rounds/${segment(roundId)}`

/* ---------- the partner's side ---------- */

export const fetchPartnerRounds = async (studyId: string) => (await http.get(`${base(studyId)}/partner/rounds`, partnerRoundListResponse)).rounds
export const fetchPartnerRound = (studyId: string, roundId: string): Promise<PartnerRound> => http.get(partnerRoundPath(studyId, roundId), partnerRound)
/** Saves a draft or sends the answer; a closed round answers 409 (the caller keeps what was typed). */
export const savePartnerAnswer = (studyId: string, roundId: string, themeId: string, body: PartnerAnswerInput): Promise<PartnerTheme> =>
  http.put(`${partnerRoundPath(studyId, roundId)}/themes/${segment(themeId)}`, body, partnerTheme)

export function usePartnerRoundsQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => themeKeys.partnerRounds(toValue(studyId)),
    query: () => fetchPartnerRounds(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

export function usePartnerRoundQuery(studyId: MaybeRefOrGetter<string>, roundId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => themeKeys.partnerRound(toValue(studyId), toValue(roundId)),
    query: () => fetchPartnerRound(toValue(studyId), toValue(roundId)),
    enabled: () => Boolean(toValue(studyId) && toValue(roundId)),
  })
}

/* ---------- themes ---------- */

export const fetchThemes = async (studyId: string): Promise<Theme[]> => (await http.get(`${base(studyId)}/themes`, themeListResponse)).themes
export const createTheme = (studyId: string, body: ThemeCreate): Promise<Theme> => http.post(`${base(studyId)}/themes`, body, themeSchema)
export const updateTheme = (studyId: string, themeId: string, body: ThemeUpdate): Promise<Theme> => http.patch(themePath(studyId, themeId), body, themeSchema)
export const orderThemes = async (studyId: string, body: ThemeOrder): Promise<Theme[]> =>
  (await http.put(`${base(studyId)}/themes/order`, body, themeListResponse)).themes
export const deleteTheme = (studyId: string, themeId: string, version: number) => http.delete(`${themePath(studyId, themeId)}?version=${version}`)

export function useThemesQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({ key: () => themeKeys.root(toValue(studyId)), query: () => fetchThemes(toValue(studyId)), enabled: () => Boolean(toValue(studyId)) })
}

function useInvalidateThemes(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () => queryCache.invalidateQueries({ key: themeKeys.root(toValue(studyId)) })
}

export function useCreateThemeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateThemes(studyId)
  return useMutation({ mutation: (body: ThemeCreate) => createTheme(toValue(studyId), body), onSettled: invalidate })
}

export function useUpdateThemeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateThemes(studyId)
  return useMutation({ mutation: ({ themeId, body }: { themeId: string; body: ThemeUpdate }) => updateTheme(toValue(studyId), themeId, body), onSettled: invalidate })
}

export function useDeleteThemeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateThemes(studyId)
  return useMutation({ mutation: (theme: Pick<Theme, 'id' | 'version'>) => deleteTheme(toValue(studyId), theme.id, theme.version), onSettled: invalidate })
}

/** An excerpt the lead may choose as supporting a theme: one carrying any of the theme's codes. */
export interface CandidateExcerpt {
  excerptId: string
  text: string
  pseudonym: string
  transcriptId: string
  start: number
}

/** A supporting excerpt as the theme form sends it. */
export type ExcerptChoice = NonNullable<ThemeUpdate['excerpts']>[number]

/** The excerpts of all the given codes, each once, in transcript order. */
export async function fetchCandidateExcerpts(studyId: string, codeIds: string[]): Promise<CandidateExcerpt[]> {
  const lists = await Promise.all(codeIds.map((codeId) => fetchCodeExcerpts(studyId, codeId)))
  const seen = new Map<string, CandidateExcerpt>()
  for (const excerpt of lists.flat()) {
    if (!seen.has(excerpt.id)) seen.set(excerpt.id, { excerptId: excerpt.id, text: excerpt.text, pseudonym: excerpt.pseudonym, transcriptId: excerpt.transcriptId, start: excerpt.start })
  }
  return [...seen.values()].sort((a, b) => a.pseudonym.localeCompare(b.pseudonym) || a.transcriptId.localeCompare(b.transcriptId) || a.start - b.start)
}

export function useCandidateExcerptsQuery(studyId: MaybeRefOrGetter<string>, codeIds: MaybeRefOrGetter<string[]>) {
  return useQuery({
    key: () => [...themeKeys.root(toValue(studyId)), 'candidates', [...toValue(codeIds)].sort().join(',')],
    query: () => fetchCandidateExcerpts(toValue(studyId), toValue(codeIds)),
    enabled: () => Boolean(toValue(studyId)) && toValue(codeIds).length > 0,
  })
}

/** The order answers with every theme: show it at once, then refresh. */
export function useOrderThemesMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  const invalidate = useInvalidateThemes(studyId)
  return useMutation({
    mutation: (body: ThemeOrder) => orderThemes(toValue(studyId), body),
    onSuccess: (themes) => queryCache.setQueryData(themeKeys.root(toValue(studyId)), themes),
    onSettled: invalidate,
  })
}

/* ---------- review rounds (the lead's side) ---------- */

export const fetchRounds = async (studyId: string): Promise<RoundSummary[]> => (await http.get(`${base(studyId)}/review-rounds`, roundListResponse)).rounds
export const fetchRound = (studyId: string, roundId: string): Promise<RoundDetail> => http.get(roundPath(studyId, roundId), roundDetail)
export const createRound = (studyId: string, body: RoundCreate): Promise<RoundDetail> => http.post(`${base(studyId)}/review-rounds`, body, roundDetail)
export const closeRound = (studyId: string, roundId: string): Promise<RoundDetail> => http.post(`${roundPath(studyId, roundId)}/close`, {}, roundDetail)
export const respondToAnswer = (studyId: string, roundId: string, answerId: string, response: string): Promise<RoundDetail> =>
  http.put(`${roundPath(studyId, roundId)}/answers/${segment(answerId)}/response`, { response }, roundDetail)

export function useRoundsQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({ key: () => themeKeys.rounds(toValue(studyId)), query: () => fetchRounds(toValue(studyId)), enabled: () => Boolean(toValue(studyId)) })
}

export function useRoundQuery(studyId: MaybeRefOrGetter<string>, roundId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => themeKeys.round(toValue(studyId), toValue(roundId)),
    query: () => fetchRound(toValue(studyId), toValue(roundId)),
    enabled: () => Boolean(toValue(studyId) && toValue(roundId)),
  })
}

/** A round changes theme statuses and the round list: refresh both. */
function useRoundAnswer(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return {
    show: (round: RoundDetail) => queryCache.setQueryData(themeKeys.round(toValue(studyId), round.id), round),
    refresh: () => {
      void queryCache.invalidateQueries({ key: themeKeys.rounds(toValue(studyId)) })
      void queryCache.invalidateQueries({ key: themeKeys.root(toValue(studyId)) })
    },
  }
}

export function useCreateRoundMutation(studyId: MaybeRefOrGetter<string>) {
  const { show, refresh } = useRoundAnswer(studyId)
  return useMutation({ mutation: (body: RoundCreate) => createRound(toValue(studyId), body), onSuccess: show, onSettled: refresh })
}

export function useCloseRoundMutation(studyId: MaybeRefOrGetter<string>) {
  const { show, refresh } = useRoundAnswer(studyId)
  return useMutation({ mutation: (roundId: string) => closeRound(toValue(studyId), roundId), onSuccess: show, onSettled: refresh })
}

export function useRespondMutation(studyId: MaybeRefOrGetter<string>) {
  const { show } = useRoundAnswer(studyId)
  return useMutation({
    mutation: ({ roundId, answerId, response }: { roundId: string; answerId: string; response: string }) => respondToAnswer(toValue(studyId), roundId, answerId, response),
    onSuccess: show,
  })
}
