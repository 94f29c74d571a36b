import { useMutation, useQuery, useQueryCache } from '@pinia/colada'
import { siteUserList, type SiteUser, type UserCreate } from '@shared/schemas/users'
import { http, segment } from './http'

/** Accounts on this site: the site administrator's list. */
export const userKeys = { list: () => ['users'] as const }

export const listUsers = async (): Promise<SiteUser[]> => (await http.get('/users', siteUserList)).users

export function useUserListQuery() {
  return useQuery({ key: userKeys.list(), query: listUsers })
}

export function useUserCreateMutation() {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: async (body: UserCreate) => {
      await http.post('/users', body)
    },
    onSettled: () => queryCache.invalidateQueries({ key: userKeys.list() }),
  })
}

export function useUserDisableMutation() {
  const queryCache = useQueryCache()
  return useMutation({
    mutation: async ({ userId, disabled }: { userId: string; disabled: boolean }) => {
      await http.patch(`/users/${segment(userId)}`, { disabled })
    },
    onSettled: () => queryCache.invalidateQueries({ key: userKeys.list() }),
  })
}
