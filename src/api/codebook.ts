import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  codeSchema,
  codebookImportResult,
  codebookResponse,
  codeExcerptsResponse,
  snapshotDetail,
  snapshotListResponse,
  type Code,
  type CodeCreate,
  type CodeMerge,
  type CodeMove,
  type CodeSplit,
  type CodeUpdate,
  type CodebookImport,
} from '@shared/schemas/coding'
import { http, segment } from './http'

/**
 * The codebook: codes (a flat list the views turn into a tree), their changes (each carries the
 * code's version; a stale one answers 409), merge, split, CSV import, snapshots.
 */
export const codebookKeys = {
  root: (studyId: string) => ['studies', studyId, 'codebook'] as const,
  codes: (studyId: string) => ['studies', studyId, 'codebook', 'codes'] as const,
  snapshots: (studyId: string) => ['studies', studyId, 'codebook', 'snapshots'] as const,
  snapshot: (studyId: string, snapshotId: string) => ['studies', studyId, 'codebook', 'snapshots', snapshotId] as const,
  codeExcerpts: (studyId: string, codeId: string) => ['studies', studyId, 'codebook', 'excerpts', codeId] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`
const one = (studyId: string, codeId: string) => `${base(studyId)}/codes/${segment(codeId)}`

export const fetchCodebook = async (studyId: string): Promise<Code[]> => (await http.get(`${base(studyId)}/codes`, codebookResponse)).codes
export const createCode = (studyId: string, body: CodeCreate): Promise<Code> => http.post(`${base(studyId)}/codes`, body, codeSchema)
export const updateCode = (studyId: string, codeId: string, body: CodeUpdate): Promise<Code> => http.patch(one(studyId, codeId), body, codeSchema)
export const moveCode = async (studyId: string, codeId: string, body: CodeMove): Promise<Code[]> =>
  (await http.put(`${one(studyId, codeId)}/position`, body, codebookResponse)).codes
export const mergeCode = async (studyId: string, codeId: string, body: CodeMerge): Promise<Code[]> =>
  (await http.post(`${one(studyId, codeId)}/merge`, body, codebookResponse)).codes
export const splitCode = async (studyId: string, codeId: string, body: CodeSplit): Promise<Code[]> =>
  (await http.post(`${one(studyId, codeId)}/split`, body, codebookResponse)).codes
export const importCodebook = (studyId: string, body: CodebookImport) => http.post(`${base(studyId)}/codebook/import`, body, codebookImportResult)
export const codebookCsvUrl = (studyId: string, bom = false) => `/api${base(studyId)}/codebook.csv${bom ? '?bom=1' : ''}`
export const fetchSnapshots = async (studyId: string) => (await http.get(`${base(studyId)}/codebook/snapshots`, snapshotListResponse)).snapshots
export const fetchSnapshot = (studyId: string, snapshotId: string) => http.get(`${base(studyId)}/codebook/snapshots/${segment(snapshotId)}`, snapshotDetail)
export const saveSnapshot = (studyId: string, name: string) => http.post(`${base(studyId)}/codebook/snapshots`, { name }, snapshotDetail)
export const fetchCodeExcerpts = async (studyId: string, codeId: string) => (await http.get(`${base(studyId)}/excerpts`, codeExcerptsResponse, { codeId })).excerpts

export function useCodebookQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => codebookKeys.codes(toValue(studyId)),
    query: () => fetchCodebook(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

export function useSnapshotsQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({ key: () => codebookKeys.snapshots(toValue(studyId)), query: () => fetchSnapshots(toValue(studyId)), enabled: () => Boolean(toValue(studyId)) })
}

export function useCodeExcerptsQuery(studyId: MaybeRefOrGetter<string>, codeId: MaybeRefOrGetter<string | null>) {
  return useQuery({
    key: () => codebookKeys.codeExcerpts(toValue(studyId), toValue(codeId) ?? ''),
    query: () => fetchCodeExcerpts(toValue(studyId), toValue(codeId)!),
    enabled: () => Boolean(toValue(studyId) && toValue(codeId)),
  })
}

/** Every codebook change refreshes the codebook (and what hangs off it: counts, excerpts of a code). */
export function useInvalidateCodebook(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () => queryCache.invalidateQueries({ key: codebookKeys.root(toValue(studyId)) })
}

export function useCreateCodeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateCodebook(studyId)
  return useMutation({ mutation: (body: CodeCreate) => createCode(toValue(studyId), body), onSettled: invalidate })
}

export function useUpdateCodeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateCodebook(studyId)
  return useMutation({ mutation: ({ codeId, body }: { codeId: string; body: CodeUpdate }) => updateCode(toValue(studyId), codeId, body), onSettled: invalidate })
}

export function useSnapshotQuery(studyId: MaybeRefOrGetter<string>, snapshotId: MaybeRefOrGetter<string | null>) {
  return useQuery({
    key: () => codebookKeys.snapshot(toValue(studyId), toValue(snapshotId) ?? ''),
    query: () => fetchSnapshot(toValue(studyId), toValue(snapshotId)!),
    enabled: () => Boolean(toValue(studyId) && toValue(snapshotId)),
  })
}

/** Moves, merges and splits answer with the whole codebook: show it at once, then refresh what hangs off it. */
function useCodebookAnswer(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return (codes: Code[]) => queryCache.setQueryData(codebookKeys.codes(toValue(studyId)), codes)
}

export function useMoveCodeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateCodebook(studyId)
  const show = useCodebookAnswer(studyId)
  return useMutation({
    mutation: ({ codeId, body }: { codeId: string; body: CodeMove }) => moveCode(toValue(studyId), codeId, body),
    onSuccess: show,
    onSettled: invalidate,
  })
}

export function useMergeCodeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateCodebook(studyId)
  const show = useCodebookAnswer(studyId)
  return useMutation({
    mutation: ({ codeId, body }: { codeId: string; body: CodeMerge }) => mergeCode(toValue(studyId), codeId, body),
    onSuccess: show,
    onSettled: invalidate,
  })
}

export function useSplitCodeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateCodebook(studyId)
  const show = useCodebookAnswer(studyId)
  return useMutation({
    mutation: ({ codeId, body }: { codeId: string; body: CodeSplit }) => splitCode(toValue(studyId), codeId, body),
    onSuccess: show,
    onSettled: invalidate,
  })
}

/** A dry run changes nothing, so only a real import refreshes the codebook. */
export function useImportCodebookMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateCodebook(studyId)
  return useMutation({
    mutation: (body: CodebookImport) => importCodebook(toValue(studyId), body),
    onSettled: (_data, _error, body) => (body.dryRun ? undefined : invalidate()),
  })
}

export function useSaveSnapshotMutation(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: (name: string) => saveSnapshot(toValue(studyId), name),
    onSettled: () => queryCache.invalidateQueries({ key: codebookKeys.snapshots(toValue(studyId)) }),
  })
}
