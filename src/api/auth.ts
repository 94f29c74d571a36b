import {
  invitationAcceptResponse,
  invitationPreview,
  meResponse,
  type InvitationAcceptResponse,
  type InvitationAccept,
  type InvitationPreview,
  type LoginRequest,
  type MeResponse,
  type PasswordChangeRequest,
} from '@shared/schemas/auth'
import { useQuery } from '@pinia/colada'
import type { MaybeRefOrGetter } from 'vue'
import { toValue } from 'vue'
import { ApiError } from './errors'
import { dropCsrfToken, http, segment } from './http'

export type { InvitationAcceptResponse }

/** Who is signed in; `null` when nobody is (the server answers 401). */
export async function fetchMe(): Promise<MeResponse | null> {
  try {
    return await http.get('/auth/me', meResponse)
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return null
    throw error
  }
}

export async function login(body: LoginRequest): Promise<MeResponse> {
  const me = await http.post('/auth/login', body, meResponse)
  dropCsrfToken()
  return me
}

export async function logout(): Promise<void> {
  try {
    await http.post('/auth/logout', undefined)
  } finally {
    dropCsrfToken()
  }
}

export async function requestPasswordReset(email: string): Promise<void> {
  await http.post('/auth/password-reset', { email })
}

export async function confirmPasswordReset(token: string, password: string): Promise<void> {
  await http.post('/auth/password-reset/confirm', { token, password })
  dropCsrfToken()
}

export async function changePassword(body: PasswordChangeRequest): Promise<void> {
  await http.post('/auth/password', body)
  dropCsrfToken()
}

export async function revokeOtherSessions(): Promise<void> {
  await http.post('/auth/sessions/revoke-others', undefined)
}

export function fetchInvitation(token: string): Promise<InvitationPreview> {
  return http.get(`/invitations/${segment(token)}`, invitationPreview)
}

export async function acceptInvitation(token: string, body: InvitationAccept): Promise<InvitationAcceptResponse> {
  const answer = await http.post(`/invitations/${segment(token)}/accept`, body, invitationAcceptResponse)
  dropCsrfToken()
  return answer
}

export const invitationKeys = { preview: (token: string) => ['invitation-preview', token] as const }

export function useInvitationPreviewQuery(token: MaybeRefOrGetter<string>) {
  return useQuery({
    key: () => invitationKeys.preview(toValue(token)),
    query: () => fetchInvitation(toValue(token)),
    staleTime: 0,
  })
}
