import type { App } from 'vue'
import { createPinia } from 'pinia'
import { PiniaColada } from '@pinia/colada'
import { vuetify } from './vuetify'
import { onSessionEnded } from '@/api/http'
import { router } from '@/router'
import { useNotificationsStore } from '@/stores/notifications'
import { useSessionStore } from '@/stores/session'

/** One place for every app-wide plugin; the order matters: Pinia Colada needs Pinia. */
export function registerPlugins(app: App): void {
  const pinia = createPinia()
  app.use(vuetify)
  app.use(pinia)
  app.use(PiniaColada, { queryOptions: { staleTime: 30_000 } })
  app.use(router)

  onSessionEnded(() => {
    const session = useSessionStore(pinia)
    if (!session.signedIn) return
    session.setMe(null)
    useNotificationsStore(pinia).notify('Your session has ended. Sign in again to carry on.')
    void router.replace({ name: 'sign-in', query: { redirect: router.currentRoute.value.fullPath } })
  })
}
