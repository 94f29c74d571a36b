import { mount, flushPromises } from '@vue/test-utils'
import { createPinia, setActivePinia, type Pinia } from 'pinia'
import { PiniaColada } from '@pinia/colada'
import { createMemoryHistory, createRouter, type Router } from 'vue-router'
import { createVuetify } from 'vuetify'
import { vi } from 'vitest'
import { createApp, type Component } from 'vue'
import type { StudyRole } from '@shared/permissions'
import { vuetifyOptions } from '@/plugins/vuetify'
import { routes } from '@/router/routes'
import { useSessionStore } from '@/stores/session'

/** The app's own Vuetify set-up (theme, defaults, icons), Pinia with Pinia Colada, and an in-memory router. */
export function createTestApp() {
  const pinia = createPinia()
  // Stores made before mounting (to sign a pretend person in) need an app to run in, as they do in the app.
  createApp({}).use(pinia).use(PiniaColada, {})
  setActivePinia(pinia)
  const router = createRouter({ history: createMemoryHistory(), routes })
  const vuetify = createVuetify(vuetifyOptions)
  return { pinia, router, vuetify }
}

export async function mountView(
  component: Component,
  options: { props?: Record<string, unknown>; path?: string; app?: { pinia: Pinia; router: Router; vuetify: ReturnType<typeof createVuetify> } } = {},
) {
  const app = options.app ?? createTestApp()
  await app.router.push(options.path ?? '/')
  await app.router.isReady()
  const wrapper = mount(component, {
    props: options.props,
    attachTo: document.body,
    global: { plugins: [app.vuetify, app.pinia, app.router] },
  })
  await flushPromises()
  return { wrapper, ...app }
}

/** Signs a pretend person in, with one role on the study `study-1`. */
export function signInAs(role: StudyRole | null, siteAdmin = false): void {
  const session = useSessionStore()
  session.setMe({
    user: { id: 'user-1', email: 'someone@heardwell.test', name: 'Sam Example', siteAdmin },
    memberships: role ? [{ studyId: 'study-1', role, studyTitle: 'Coming Home After Stroke', studyCode: 'CHAS' }] : [],
  })
}

type Reply = { status: number; body?: unknown }
export interface FetchCall {
  url: string
  method: string
  headers: Record<string, string>
  body?: string
}

/** Replaces `fetch`: each handler answers for one `METHOD /api/path`; every call is recorded. */
export function stubFetch(handlers: Record<string, Reply | Reply[] | Error>) {
  const calls: FetchCall[] = []
  const queues = new Map(Object.entries(handlers).map(([key, value]) => [key, Array.isArray(value) ? [...value] : value]))
  const fetchStub = vi.fn(async (input: string, init: RequestInit = {}) => {
    const method = init.method ?? 'GET'
    const url = String(input)
    calls.push({ url, method, headers: { ...(init.headers as Record<string, string>) }, body: init.body as string | undefined })
    const entry = queues.get(`${method} ${url.split('?')[0]}`)
    if (entry instanceof Error) throw entry
    const reply = Array.isArray(entry) ? (entry.length > 1 ? entry.shift() : entry[0]) : entry
    if (!reply) return new Response(JSON.stringify({ type: 'not-found', title: 'Not found', status: 404 }), { status: 404 })
    const isProblem = reply.status >= 400
    return new Response(reply.body === undefined ? null : JSON.stringify(reply.body), {
      status: reply.status,
      headers: { 'Content-Type': isProblem ? 'application/problem+json' : 'application/json' },
    })
  })
  vi.stubGlobal('fetch', fetchStub)
  return { calls, fetchStub }
}

/** happy-dom has no visualViewport, which Vuetify's overlays (dialogs, menus) read to position themselves. */
export function stubVisualViewport(): void {
  vi.stubGlobal('visualViewport', { width: 1024, height: 768, offsetLeft: 0, offsetTop: 0, scale: 1, addEventListener() {}, removeEventListener() {} })
}

export { flushPromises }
