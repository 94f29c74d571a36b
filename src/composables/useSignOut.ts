import { ref } from 'vue'
import { useRouter } from 'vue-router'
import { useSessionStore } from '@/stores/session'
import { useNotificationsStore } from '@/stores/notifications'

/** Signs out, goes to the sign-in page, then forgets the cached study data. */
export function useSignOut() {
  const session = useSessionStore()
  const notifications = useNotificationsStore()
  const router = useRouter()
  const signingOut = ref(false)

  async function signOut(): Promise<void> {
    signingOut.value = true
    try {
      await session.signOut()
      await router.replace({ name: 'sign-in' })
      session.forgetServerData()
      notifications.notify('You are signed out.')
    } catch (error) {
      notifications.failure(error)
    } finally {
      signingOut.value = false
    }
  }

  return { signOut, signingOut }
}
