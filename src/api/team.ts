import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { toValue, type MaybeRefOrGetter } from 'vue'
import type { StudyRole } from '@shared/permissions'
import {
  invitationListResponse,
  memberListResponse,
  type Invitation,
  type InvitationCreate,
  type Member,
} from '@shared/schemas/studies'
import { http, segment } from './http'
import { studyKeys } from './studies'

/** The study team: members and the invitations still open. Keys sit under the study's own key. */
export const teamKeys = {
  members: (studyId: string) => ['studies', studyId, 'members'] as const,
  invitations: (studyId: string) => ['studies', studyId, 'invitations'] as const,
}

const base = (studyId: string) => `/studies/${segment(studyId)}`

export const listMembers = async (studyId: string): Promise<Member[]> =>
  (await http.get(`${base(studyId)}/members`, memberListResponse)).members
export const listInvitations = async (studyId: string): Promise<Invitation[]> =>
  (await http.get(`${base(studyId)}/invitations`, invitationListResponse)).invitations

export function useMemberListQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => teamKeys.members(toValue(studyId)),
    query: () => listMembers(toValue(studyId)),
    enabled: () => toValue(enabled),
  })
}

export function useInvitationListQuery(studyId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    key: () => teamKeys.invitations(toValue(studyId)),
    query: () => listInvitations(toValue(studyId)),
    enabled: () => toValue(enabled),
  })
}

function useInvalidateStudy(studyId: MaybeRefOrGetter<string>) {
  const queryCache = useQueryCache()
  // The study's member count and the list of studies change with the team, so refresh them too.
  return () =>
    Promise.all([
      queryCache.invalidateQueries({ key: ['studies', toValue(studyId)] }),
      queryCache.invalidateQueries({ key: studyKeys.list() }),
    ])
}

export function useMemberRoleMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateStudy(studyId)
  return useMutation({
    mutation: async ({ memberId, role }: { memberId: string; role: StudyRole }) => {
      await http.patch(`${base(toValue(studyId))}/members/${segment(memberId)}`, { role })
    },
    onSettled: invalidate,
  })
}

export function useMemberRemoveMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateStudy(studyId)
  return useMutation({
    mutation: (memberId: string) => http.delete(`${base(toValue(studyId))}/members/${segment(memberId)}`),
    onSettled: invalidate,
  })
}

export function useInvitationCreateMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateStudy(studyId)
  return useMutation({
    mutation: async (body: InvitationCreate) => {
      await http.post(`${base(toValue(studyId))}/invitations`, body)
    },
    onSettled: invalidate,
  })
}

export function useInvitationRevokeMutation(studyId: MaybeRefOrGetter<string>) {
  const invalidate = useInvalidateStudy(studyId)
  return useMutation({
    mutation: (invitationId: string) => http.delete(`${base(toValue(studyId))}/invitations/${segment(invitationId)}`),
    onSettled: invalidate,
  })
}
