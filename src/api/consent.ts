import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { ref, toValue, type MaybeRefOrGetter } from 'vue'
import {
  consentSummary,
  participantConsentView,
  type ConsentSummary,
  type ParticipantConsentView,
  type StaffConsentInput,
  type WithdrawalInput,
} from '@shared/schemas/consent'
import { consentKeys } from './consentForms'
import { http, segment, type UploadProgress } from './http'
import { participantKeys } from './participants'
import { recruitmentKeys } from './recruitment'

/** One participant's consent records, links and withdrawal; the study's consent dashboard. */
const base = (studyId: string, participantId: string) => `/studies/${segment(studyId)}/participants/${segment(participantId)}`

export const fetchParticipantConsent = (studyId: string, participantId: string): Promise<ParticipantConsentView> =>
  http.get(`${base(studyId, participantId)}/consent`, participantConsentView)
export const recordVerbalConsent = (studyId: string, participantId: string, body: StaffConsentInput): Promise<ParticipantConsentView> =>
  http.post(`${base(studyId, participantId)}/consents`, body, participantConsentView)
export function recordWrittenConsent(
  studyId: string,
  participantId: string,
  metadata: StaffConsentInput,
  file: File,
  onProgress?: UploadProgress,
): Promise<ParticipantConsentView> {
  const form = new FormData()
  form.append('metadata', JSON.stringify(metadata))
  form.append('file', file)
  return http.upload(`${base(studyId, participantId)}/consents/written`, form, participantConsentView, onProgress)
}
export const sendConsentLink = (studyId: string, participantId: string, formId?: string): Promise<ParticipantConsentView> =>
  http.post(`${base(studyId, participantId)}/consent-links`, formId ? { formId } : {}, participantConsentView)
export const recordWithdrawal = (studyId: string, participantId: string, body: WithdrawalInput): Promise<ParticipantConsentView> =>
  http.post(`${base(studyId, participantId)}/withdrawal`, body, participantConsentView)
export const fetchConsentSummary = (studyId: string): Promise<ConsentSummary> =>
  http.get(`/studies/${segment(studyId)}/consent/summary`, consentSummary)

/** The receipt of an electronic consent is a plain download link. */
export function consentReceiptUrl(studyId: string, participantId: string, consentId: string): string {
  return `/api${base(studyId, participantId)}/consents/${segment(consentId)}/receipt.pdf`
}

export function useParticipantConsentQuery(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => consentKeys.participant(toValue(studyId), toValue(participantId)),
    query: () => fetchParticipantConsent(toValue(studyId), toValue(participantId)),
    enabled: () => Boolean(toValue(studyId) && toValue(participantId)),
  })
}

export function useConsentSummaryQuery(studyId: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => consentKeys.summary(toValue(studyId)),
    query: () => fetchConsentSummary(toValue(studyId)),
    enabled: () => Boolean(toValue(studyId)),
  })
}

/** Consent and withdrawal change the participant's status, the lists and both dashboards. */
function useInvalidateConsent(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  return () =>
    Promise.all([
      queryCache.invalidateQueries({ key: consentKeys.root(toValue(studyId)) }),
      queryCache.invalidateQueries({ key: participantKeys.root(toValue(studyId)) }),
      queryCache.invalidateQueries({ key: recruitmentKeys.root(toValue(studyId)) }),
    ])
}

export interface StaffConsentRequest {
  body: StaffConsentInput
  /** the scan of the signed form; without it the consent is recorded as verbal */
  file?: File
}

/** Records verbal consent, or written consent with its scan; `progress` follows the scan's upload. */
export function useStaffConsentMutation(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateConsent(studyId)
  const progress = ref<number | null>(null)
  const mutation = useMutation({
    mutation: ({ body, file }: StaffConsentRequest) => {
      if (!file) return recordVerbalConsent(toValue(studyId), toValue(participantId), body)
      progress.value = 0
      return recordWrittenConsent(toValue(studyId), toValue(participantId), body, file, (fraction) => (progress.value = fraction))
    },
    onSettled: () => {
      progress.value = null
      return invalidate()
    },
  })
  return { ...mutation, progress }
}

/** Sends a single-use e-consent link; `participantId` per call so the dashboard can send to anyone in its queue. */
export function useConsentLinkMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateConsent(studyId)
  return useMutation({
    mutation: ({ participantId, formId }: { participantId: string; formId?: string }) => sendConsentLink(toValue(studyId), participantId, formId),
    onSettled: invalidate,
  })
}

export function useWithdrawalMutation(studyId: MaybeRefOrGetter<string>, participantId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateConsent(studyId)
  return useMutation({ mutation: (body: WithdrawalInput) => recordWithdrawal(toValue(studyId), toValue(participantId), body), onSettled: invalidate })
}
