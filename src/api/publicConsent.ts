import { useMutation, useQuery } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import {
  publicConsentPage,
  publicConsentResult,
  publicWithdrawalPage,
  type PublicConsentPage,
  type PublicConsentResult,
  type PublicConsentSubmit,
  type PublicWithdrawalPage,
  type PublicWithdrawalSubmit,
} from '@shared/schemas/consent'
import { http, segment } from './http'

/** The e-mailed consent and withdrawal pages: no sign-in. Keys sit outside `studies`, like the public study page. */
export const publicConsentKeys = {
  consent: (token: string) => ['public', 'consent', token] as const,
  withdrawal: (token: string) => ['public', 'withdrawal', token] as const,
}

const consentBase = (token: string) => `/public/consent/${segment(token)}`
const withdrawalBase = (token: string) => `/public/withdrawal/${segment(token)}`

export const fetchPublicConsent = (token: string): Promise<PublicConsentPage> => http.get(consentBase(token), publicConsentPage)
export const signPublicConsent = (token: string, body: PublicConsentSubmit): Promise<PublicConsentResult> =>
  http.post(consentBase(token), body, publicConsentResult)
export const fetchPublicWithdrawal = (token: string): Promise<PublicWithdrawalPage> => http.get(withdrawalBase(token), publicWithdrawalPage)
export const askToWithdraw = async (token: string, body: PublicWithdrawalSubmit): Promise<void> => {
  await http.post(withdrawalBase(token), body)
}

/** The form file, as a plain download link. */
export function publicConsentFileUrl(token: string): string {
  return `/api${consentBase(token)}/file`
}

export function usePublicConsentQuery(token: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => publicConsentKeys.consent(toValue(token)),
    query: () => fetchPublicConsent(toValue(token)),
    enabled: () => Boolean(toValue(token)),
  })
}

export function usePublicConsentSignMutation(token: MaybeRefOrGetter<string>) {
  return useMutation({ mutation: (body: PublicConsentSubmit) => signPublicConsent(toValue(token), body) })
}

export function usePublicWithdrawalQuery(token: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => publicConsentKeys.withdrawal(toValue(token)),
    query: () => fetchPublicWithdrawal(toValue(token)),
    enabled: () => Boolean(toValue(token)),
  })
}

export function usePublicWithdrawalMutation(token: MaybeRefOrGetter<string>) {
  return useMutation({ mutation: (body: PublicWithdrawalSubmit) => askToWithdraw(toValue(token), body) })
}
