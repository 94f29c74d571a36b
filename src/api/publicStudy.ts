import { useMutation, useQuery } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import { publicEnquiryResult, publicStudy, type PublicEnquiry, type PublicEnquiryResult, type PublicStudy } from '@shared/schemas/recruitment'
import { http, segment } from './http'

/** The public study page: no sign-in. Its keys sit outside `studies` so signing out does not touch them. */
export const publicStudyKeys = {
  study: (code: string) => ['public', 'studies', code] as const,
}

const base = (code: string) => `/public/studies/${segment(code)}`

export const fetchPublicStudy = (code: string): Promise<PublicStudy> => http.get(base(code), publicStudy)
export const sendEnquiry = (code: string, body: PublicEnquiry): Promise<PublicEnquiryResult> =>
  http.post(`${base(code)}/enquiries`, body, publicEnquiryResult)

export function usePublicStudyQuery(code: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => publicStudyKeys.study(toValue(code)),
    query: () => fetchPublicStudy(toValue(code)),
    enabled: () => Boolean(toValue(code)),
  })
}

export function useEnquirySendMutation(code: MaybeRefOrGetter<string>) {
  return useMutation({ mutation: (body: PublicEnquiry) => sendEnquiry(toValue(code), body) })
}
