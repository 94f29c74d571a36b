import { createRouter, createWebHistory, type RouteLocationNormalized, type RouteLocationRaw } from 'vue-router'
import { useSessionStore } from '@/stores/session'
import { safeRedirect } from './redirect'
import { routes } from './routes'

export const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
})


/** The one guard: signed out → sign-in (then back); signed in but not allowed → the "not allowed" page. */
export async function accessGuard(
  to: Pick<RouteLocationNormalized, 'meta' | 'params' | 'query' | 'fullPath'> & { name?: RouteLocationNormalized['name'] | null },
): Promise<true | RouteLocationRaw> {
  const session = useSessionStore()
  // fetch the page's code while the session is checked, not after
  for (const record of (to as Partial<RouteLocationNormalized>).matched ?? []) {
    const view = record.components?.default
    if (typeof view === 'function') void (view as () => Promise<unknown>)()?.catch?.(() => {})
  }
  await session.ensureLoaded()

  if (to.meta.public) {
    if (to.name === 'sign-in' && session.signedIn) return safeRedirect(to.query.redirect) ?? { name: 'my-studies' }
    return true
  }
  if (!session.signedIn) {
    return { name: 'sign-in', query: to.fullPath === '/' ? {} : { redirect: to.fullPath } }
  }
  const studyId = typeof to.params.studyId === 'string' ? to.params.studyId : undefined
  const allowed =
    (!to.meta.siteAdmin || session.isSiteAdmin) && (!to.meta.permission || session.can(studyId, to.meta.permission))
  return allowed ? true : { name: 'not-allowed', query: { from: to.fullPath } }
}

router.beforeEach(accessGuard)

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Heardwell` : 'Heardwell'
})
