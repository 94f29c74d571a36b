import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { ref, toValue, type MaybeRefOrGetter } from 'vue'
import { consentFormList, consentFormSchema, type ConsentForm, type ConsentFormCreate, type ConsentFormUpdate } from '@shared/schemas/consent'
import { http, segment, type UploadProgress } from './http'

/** A study's consent form versions: the list, a new version with its file, edits to drafts, approval. */
export const consentKeys = {
  root: (studyId: string) => ['studies', studyId, 'consent'] as const,
  forms: (studyId: string) => ['studies', studyId, 'consent', 'forms'] as const,
  participant: (studyId: string, participantId: string) => ['studies', studyId, 'consent', 'participants', participantId] as const,
  summary: (studyId: string) => ['studies', studyId, 'consent', 'summary'] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}/consent-forms`

export const listConsentForms = async (studyId: string): Promise<ConsentForm[]> => (await http.get(base(studyId), consentFormList)).forms
export function createConsentForm(studyId: string, metadata: ConsentFormCreate, file: File, onProgress?: UploadProgress): Promise<ConsentForm> {
  const form = new FormData()
  form.append('metadata', JSON.stringify(metadata))
  form.append('file', file)
  return http.upload(base(studyId), form, consentFormSchema, onProgress)
}
export const updateConsentForm = (studyId: string, formId: string, body: ConsentFormUpdate): Promise<ConsentForm> =>
  http.patch(`${base(studyId)}/${segment(formId)}`, body, consentFormSchema)
export const approveConsentForm = (studyId: string, formId: string): Promise<ConsentForm> =>
  http.post(`${base(studyId)}/${segment(formId)}/approve`, {}, consentFormSchema)

/** The approved file is a plain download link, so it does not go through http.ts. */
export function consentFormFileUrl(studyId: string, formId: string): string {
  return `/api${base(studyId)}/${segment(formId)}/file`
}

export function useConsentFormsQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => consentKeys.forms(toValue(studyId)),
    query: () => listConsentForms(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)) && toValue(enabled),
  })
}

/** A version changes the list, the dashboard and the re-consent queue. */
function useInvalidateConsent(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () => queryCache.invalidateQueries({ key: consentKeys.root(toValue(studyId)) })
}

/** Adds a version; `progress` follows the file's upload from 0 to 1 (null when nothing is going up). */
export function useConsentFormCreateMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateConsent(studyId)
  const progress = ref<number | null>(null)
  const mutation = useMutation({
    mutation: ({ metadata, file }: { metadata: ConsentFormCreate; file: File }) => {
      progress.value = 0
      return createConsentForm(toValue(studyId), metadata, file, (fraction) => (progress.value = fraction))
    },
    onSettled: () => {
      progress.value = null
      return invalidate()
    },
  })
  return { ...mutation, progress }
}

export function useConsentFormUpdateMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateConsent(studyId)
  return useMutation({
    mutation: ({ formId, body }: { formId: string; body: ConsentFormUpdate }) => updateConsentForm(toValue(studyId), formId, body),
    onSettled: invalidate,
  })
}

export function useConsentFormApproveMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateConsent(studyId)
  return useMutation({ mutation: (formId: string) => approveConsentForm(toValue(studyId), formId), onSettled: invalidate })
}
