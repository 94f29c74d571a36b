import { afterEach, describe, expect, it } from 'vitest'
import { vi } from 'vitest'
import SignInView from '@/views/auth/SignInView.vue'
import { flushPromises, mountView, stubFetch } from './support'
import { dropCsrfToken } from '@/api/http'

async function fillAndSubmit(wrapper: Awaited<ReturnType<typeof mountView>>['wrapper']) {
  await wrapper.find('input[autocomplete="username"]').setValue('lead@heardwell.test')
  await wrapper.find('input[autocomplete="current-password"]').setValue('not-the-right-one-at-all')
  await wrapper.find('form').trigger('submit')
  await vi.waitFor(async () => {
    await flushPromises()
    expect(wrapper.find('[data-test="sign-in-problem"]').exists()).toBe(true)
  })
}

describe('sign-in page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    dropCsrfToken()
    document.body.innerHTML = ''
  })

  it('offers a password field with type=password and the autocomplete hints password managers use', async () => {
    stubFetch({})
    const { wrapper } = await mountView(SignInView, { path: '/sign-in' })
    const password = wrapper.find('input[autocomplete="current-password"]')
    expect(password.attributes('type')).toBe('password')
    expect(wrapper.find('input[type="email"]').attributes('autocomplete')).toBe('username')
    expect(password.attributes('onpaste')).toBeUndefined()

    await wrapper.find('button[aria-label="Show password"]').trigger('click')
    expect(wrapper.find('input[autocomplete="current-password"]').attributes('type')).toBe('text')
  })

  it('says plainly that the e-mail or password is not right when the server answers 401', async () => {
    stubFetch({
      'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
      'POST /api/auth/login': { status: 401, body: { type: '/problems/unauthenticated', title: 'Unauthorized', status: 401 } },
    })
    const { wrapper } = await mountView(SignInView, { path: '/sign-in' })
    await fillAndSubmit(wrapper)
    expect(wrapper.find('[data-test="sign-in-problem"]').text()).toContain('The e-mail or password is not right.')
  })

  it("shows the server's own words about waiting when there were too many attempts", async () => {
    const { calls } = stubFetch({
      'GET /api/auth/csrf': { status: 200, body: { token: 'csrf-1' } },
      'POST /api/auth/login': {
        status: 429,
        body: { type: '/problems/too-many-attempts', title: 'Too many attempts', status: 429, detail: 'Too many sign-in attempts. Wait 5 minutes, then try again.' },
      },
    })
    const { wrapper } = await mountView(SignInView, { path: '/sign-in' })
    await fillAndSubmit(wrapper)
    expect(wrapper.find('[data-test="sign-in-problem"]').text()).toContain('Too many sign-in attempts. Wait 5 minutes, then try again.')
    const login = calls.find((c) => c.url === '/api/auth/login')
    expect(login?.headers['X-CSRF-Token']).toBe('csrf-1')
  })
})
