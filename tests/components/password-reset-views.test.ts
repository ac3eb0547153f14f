import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'

vi.mock('@/api/auth', () => ({
  signIn: vi.fn(),
  signOut: vi.fn(),
  fetchMe: vi.fn(),
  changePassword: vi.fn(),
  fetchInvitation: vi.fn(),
  acceptInvitation: vi.fn(),
  requestPasswordReset: vi.fn(),
  confirmPasswordReset: vi.fn(),
}))

import { confirmPasswordReset, requestPasswordReset } from '@/api/auth'
import { ApiError } from '@/api/errors'
import ForgotPasswordView from '@/views/ForgotPasswordView.vue'
import ResetPasswordView from '@/views/ResetPasswordView.vue'
import SignInView from '@/views/SignInView.vue'
import { mountView } from './mount'

const TOKEN = 'r'.repeat(43)

beforeEach(() => {
  vi.mocked(requestPasswordReset).mockReset()
  vi.mocked(confirmPasswordReset).mockReset()
})

async function resetPage() {
  const { wrapper } = await mountView(ResetPasswordView, { path: `/reset-password?token=${TOKEN}` })
  await flushPromises()
  return wrapper
}
async function choose(wrapper: Awaited<ReturnType<typeof resetPage>>, password: string, repeat = password) {
  await wrapper.find('input[name="newPassword"]').setValue(password)
  await wrapper.find('input[name="confirmPassword"]').setValue(repeat)
  await wrapper.find('form').trigger('submit')
  await flushPromises()
}

describe('forgotten password pages', () => {
  it('links from sign-in to the request page, carrying the address typed so far', async () => {
    const { wrapper } = await mountView(SignInView)
    await wrapper.find('input[type="email"]').setValue('sam@example.test')
    expect(wrapper.find('[data-test="forgot-password"]').attributes('href')).toBe('/forgot-password?email=sam@example.test')
  })

  it('checks the address, asks once, and gives the same answer whatever the server knows', async () => {
    vi.mocked(requestPasswordReset).mockResolvedValue({ message: 'If that address belongs to an active account, a reset link is on its way' })
    const { wrapper } = await mountView(ForgotPasswordView, { path: '/forgot-password?email=not-an-address' })
    await flushPromises()
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(requestPasswordReset).not.toHaveBeenCalled()
    expect(wrapper.text()).toContain('not an e-mail address')
    await wrapper.find('input[name="email"]').setValue(' Sam@Example.test ')
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(requestPasswordReset).toHaveBeenCalledWith('sam@example.test')
    expect(wrapper.find('[data-test="reset-requested"]').text()).toBe(
      'If sam@example.test belongs to an active account, a reset link is on its way. It works for an hour and only once.',
    )
  })

  it('holds to the password rules before asking the server, then says it is done', async () => {
    const wrapper = await resetPage()
    await choose(wrapper, 'short')
    expect(wrapper.text()).toContain('at least 10 characters')
    await choose(wrapper, 'long-enough-password', 'long-enough-passwort')
    expect(wrapper.text()).toContain('the passwords differ')
    expect(confirmPasswordReset).not.toHaveBeenCalled()
    await choose(wrapper, 'long-enough-password')
    expect(confirmPasswordReset).toHaveBeenCalledWith({ token: TOKEN, password: 'long-enough-password' })
    expect(wrapper.find('[data-test="reset-done"]').text()).toContain('sign in again with the new password')
  })

  it('says in the server’s words when the link has expired, and offers a new one instead of the form', async () => {
    vi.mocked(confirmPasswordReset).mockRejectedValue(
      new ApiError({
        status: 400,
        code: 'invalid_input',
        message: 'This reset link has expired (they last 60 minutes); ask for a new one',
        fields: { token: 'expired' },
      }),
    )
    const wrapper = await resetPage()
    await choose(wrapper, 'long-enough-password')
    expect(wrapper.find('[data-test="reset-dead-link"]').text()).toBe('This reset link has expired (they last 60 minutes); ask for a new one')
    expect(wrapper.find('form').exists()).toBe(false)
    expect(wrapper.find('a[href="/forgot-password"]').text()).toBe('Ask for a new link')
  })

  it('says so when opened without a token', async () => {
    const { wrapper } = await mountView(ResetPasswordView, { path: '/reset-password' })
    await flushPromises()
    expect(wrapper.find('[data-test="reset-dead-link"]').text()).toBe('This page needs the link from a password reset e-mail.')
  })
})
