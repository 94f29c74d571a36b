import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { useQueryCache } from '@pinia/colada'
import { can as permits, type StudyAction, type StudyRole } from '@shared/permissions'
import type { LoginRequest, MeResponse, Membership, User } from '@shared/schemas/auth'
import { fetchMe, login, logout } from '@/api/auth'

/** Who is signed in and on which studies, with the role helpers the client uses to hide what a person cannot open. */
export const useSessionStore = defineStore('session', () => {
  const queryCache = useQueryCache()
  const user = ref<User | null>(null)
  const memberships = ref<Membership[]>([])
  const loaded = ref(false)
  let pending: Promise<void> | null = null

  const signedIn = computed(() => user.value !== null)
  const isSiteAdmin = computed(() => user.value?.siteAdmin === true)

  function setMe(me: MeResponse | null): void {
    user.value = me?.user ?? null
    memberships.value = me?.memberships ?? []
    loaded.value = true
  }

  /** Asks the server once per page load; a 401 (or no answer) means signed out. */
  function ensureLoaded(): Promise<void> {
    if (loaded.value) return Promise.resolve()
    pending ??= refresh().finally(() => {
      pending = null
    })
    return pending
  }

  async function refresh(): Promise<void> {
    try {
      setMe(await fetchMe())
    } catch {
      setMe(null)
    }
  }

  /**
   * Forget cached answers: the next person at this computer must not see the last one's data.
   * Callers leave the signed-in pages first, so what is still in use (a public page's own query) stays.
   */
  function forgetServerData(): void {
    for (const entry of queryCache.getEntries()) {
      if (entry.deps.size === 0) queryCache.remove(entry)
    }
  }

  async function signIn(credentials: LoginRequest): Promise<void> {
    const me = await login(credentials)
    forgetServerData()
    setMe(me)
  }

  /** Only a confirmed sign-out clears the session here: if the server was not reached, the person is still signed in. */
  async function signOut(): Promise<void> {
    await logout()
    setMe(null)
  }

  function membershipIn(studyId: string | undefined): Membership | undefined {
    return studyId ? memberships.value.find((m) => m.studyId === studyId) : undefined
  }

  function roleIn(studyId: string | undefined): StudyRole | null {
    return membershipIn(studyId)?.role ?? null
  }

  function can(studyId: string | undefined, action: StudyAction): boolean {
    if (!user.value || !studyId) return false
    return permits(roleIn(studyId), user.value.siteAdmin, action)
  }

  return { user, memberships, loaded, signedIn, isSiteAdmin, setMe, ensureLoaded, refresh, forgetServerData, signIn, signOut, membershipIn, roleIn, can }
})
