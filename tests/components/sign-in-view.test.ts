import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'

vi.mock('@/api/auth', () => ({
  signIn: vi.fn(),
  signOut: vi.fn(),
  fetchMe: vi.fn(),
  changePassword: vi.fn(),
  fetchInvitation: vi.fn(),
  acceptInvitation: vi.fn(),
}))

import { signIn } from '@/api/auth'
import { ApiError } from '@/api/errors'
import SignInView from '@/views/SignInView.vue'
import { mountView } from './mount'

async function attempt(email: string, password: string) {
  const { wrapper, router } = await mountView(SignInView)
  await wrapper.find('input[type="email"]').setValue(email)
  await wrapper.find('input[type="password"]').setValue(password)
  await wrapper.find('form').trigger('submit')
  await flushPromises()
  return { wrapper, router }
}

beforeEach(() => {
  vi.mocked(signIn).mockReset()
})

describe('SignInView', () => {
  it('tells how long to wait when the server rate-limits sign-in', async () => {
    vi.mocked(signIn).mockRejectedValue(new ApiError({ status: 429, code: 'rate_limited', message: 'Too many requests', retryAfterSeconds: 90 }))
    const { wrapper } = await attempt('sam@example.test', 'wrong-password')

    expect(wrapper.find('[data-test="sign-in-error"]').text()).toBe('Too many sign-in attempts. Try again in 2 minutes.')
  })

  it('counts seconds when the wait is under a minute', async () => {
    vi.mocked(signIn).mockRejectedValue(new ApiError({ status: 429, code: 'rate_limited', message: 'Too many requests', retryAfterSeconds: 45 }))
    const { wrapper } = await attempt('sam@example.test', 'wrong-password')

    expect(wrapper.find('[data-test="sign-in-error"]').text()).toBe('Too many sign-in attempts. Try again in 45 seconds.')
  })

  it('says plainly when the e-mail and password do not match', async () => {
    vi.mocked(signIn).mockRejectedValue(new ApiError({ status: 401, code: 'bad_credentials', message: 'Bad credentials' }))
    const { wrapper } = await attempt('sam@example.test', 'wrong-password')

    expect(wrapper.find('[data-test="sign-in-error"]').text()).toBe('That e-mail and password do not match an active account.')
  })

  it('checks the e-mail before asking the server', async () => {
    const { wrapper } = await attempt('not-an-address', 'whatever')

    expect(signIn).not.toHaveBeenCalled()
    expect(wrapper.text()).toContain('not an e-mail address')
  })

  it('drops the e-mail message as soon as the e-mail is changed, keeping it off a corrected value', async () => {
    const { wrapper } = await attempt('not-an-address', 'whatever')
    expect(wrapper.text()).toContain('not an e-mail address')
    await wrapper.find('input[type="email"]').setValue('sam@example.test')
    await flushPromises()
    expect(wrapper.text()).not.toContain('not an e-mail address')
  })

  it("signs in and goes to the overview (a keeper's home)", async () => {
    vi.mocked(signIn).mockResolvedValue({
      token: 'jwt-token',
      expiresAt: '2030-01-01T00:00:00.000Z',
      user: {
        id: 1,
        email: 'sam@example.test',
        name: 'Sam',
        role: 'keeper',
        active: true,
        siteIds: [],
        clientId: null,
        organizationId: 1,
        createdAt: '2025-01-01T00:00:00.000Z',
      },
      organization: { id: 1, name: 'Harbour Fish Room', clockStyle: '24h' },
    })
    const { router } = await attempt(' Sam@Example.test ', 'correct horse battery')

    expect(signIn).toHaveBeenCalledWith({ email: 'sam@example.test', password: 'correct horse battery' })
    expect(localStorage.getItem('tw.token')).toBe('jwt-token')
    expect(router.currentRoute.value.name).toBe('overview')
  })
})
