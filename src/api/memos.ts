import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { memoListResponse, memoSchema, type Memo, type MemoCreate, type MemoTarget, type MemoUpdate } from '@shared/schemas/coding'
import { http, segment } from './http'

/** Memos on the study, a transcript, an excerpt or a code; each change carries the memo's version (409 when stale). */
export interface MemoFilter {
  targetType?: MemoTarget | null
  targetId?: string | null
  /** full-text search on the server */
  q?: string | null
}

export const memoKeys = {
  root: (studyId: string) => ['studies', studyId, 'memos'] as const,
  list: (studyId: string, filter: MemoFilter) => ['studies', studyId, 'memos', filter.targetType ?? '', filter.targetId ?? '', filter.q ?? ''] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}/memos`

export const listMemos = async (studyId: string, filter: MemoFilter): Promise<Memo[]> =>
  (await http.get(base(studyId), memoListResponse, { targetType: filter.targetType, targetId: filter.targetId, q: filter.q?.trim() })).memos
export const createMemo = (studyId: string, body: MemoCreate): Promise<Memo> => http.post(base(studyId), body, memoSchema)
export const updateMemo = (studyId: string, memoId: string, body: MemoUpdate): Promise<Memo> => http.patch(`${base(studyId)}/${segment(memoId)}`, body, memoSchema)
export const deleteMemo = (studyId: string, memoId: string) => http.delete(`${base(studyId)}/${segment(memoId)}`)

export function useMemosQuery(studyId: MaybeRefOrGetter<string>, filter: MaybeRefOrGetter<MemoFilter>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => memoKeys.list(toValue(studyId), toValue(filter)),
    query: () => listMemos(toValue(studyId), toValue(filter)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

function useInvalidateMemos(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () => queryCache.invalidateQueries({ key: memoKeys.root(toValue(studyId)) })
}

export function useCreateMemoMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateMemos(studyId)
  return useMutation({ mutation: (body: MemoCreate) => createMemo(toValue(studyId), body), onSettled: invalidate })
}

export function useUpdateMemoMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateMemos(studyId)
  return useMutation({ mutation: ({ memoId, body }: { memoId: string; body: MemoUpdate }) => updateMemo(toValue(studyId), memoId, body), onSettled: invalidate })
}

export function useDeleteMemoMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateMemos(studyId)
  return useMutation({ mutation: (memoId: string) => deleteMemo(toValue(studyId), memoId), onSettled: invalidate })
}
