import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { Invitation, PublicUser } from '@shared/schemas/auth'

vi.mock('@/api/users', () => ({ listUsers: vi.fn(), updateUser: vi.fn(), listInvitations: vi.fn(), createInvitation: vi.fn(), revokeInvitation: vi.fn() }))
vi.mock('@/api/sites', () => ({ listSites: vi.fn() }))

import { listSites } from '@/api/sites'
import { createInvitation, listInvitations, listUsers, revokeInvitation, updateUser } from '@/api/users'
import { ApiError } from '@/api/errors'
import UsersView from '@/views/UsersView.vue'
import { mountView, userWithRole } from './mount'

const owner: PublicUser = { ...userWithRole('owner'), id: 7, name: 'Pat Owner' }
const keeper: PublicUser = { ...userWithRole('keeper'), id: 8, name: 'Sam Keeper', email: 'sam@example.test' }
const waiting: Invitation = {
  id: 8,
  email: 'new@example.test',
  name: 'Robin New',
  role: 'keeper',
  clientId: null,
  siteIds: [],
  expiresAt: '2026-03-10T00:00:00.000Z',
  createdAt: '2026-03-03T00:00:00.000Z',
}

beforeEach(() => {
  vi.mocked(listUsers).mockReset().mockResolvedValue([owner, keeper])
  vi.mocked(listInvitations).mockReset().mockResolvedValue([waiting])
  vi.mocked(listSites).mockReset().mockResolvedValue([])
  vi.mocked(createInvitation).mockReset()
  vi.mocked(updateUser).mockReset()
  vi.mocked(revokeInvitation).mockReset()
})

async function openPeople() {
  const { wrapper } = await mountView(UsersView, { role: 'owner', path: '/users' })
  await flushPromises()
  return wrapper
}

async function fillInvite(email: string) {
  const body = document.body
  ;(body.querySelector('input[name="email"]') as HTMLInputElement).value = email
  body.querySelector('input[name="email"]')!.dispatchEvent(new Event('input'))
  ;(body.querySelector('input[name="name"]') as HTMLInputElement).value = 'Robin Alder'
  body.querySelector('input[name="name"]')!.dispatchEvent(new Event('input'))
  await flushPromises()
  ;(body.querySelector('.v-dialog form') as HTMLFormElement).dispatchEvent(new Event('submit'))
  await flushPromises()
}

describe('UsersView', () => {
  it('lists the team and the invitations waiting', async () => {
    const wrapper = await openPeople()
    expect(wrapper.text()).toContain('Sam Keeper')
    expect(wrapper.text()).toContain('Robin New')
    wrapper.unmount()
  })

  it('keeps the dialog open after an invitation, showing the link to hand over', async () => {
    vi.mocked(createInvitation).mockResolvedValue({ invitation: { ...waiting, id: 9, email: 'robin@example.test' }, link: '/invitations/abc' })
    const wrapper = await openPeople()
    await wrapper.find('button.v-btn.bg-primary').trigger('click')
    await flushPromises()
    await fillInvite('robin@example.test')
    expect(createInvitation).toHaveBeenCalledWith({ email: 'robin@example.test', name: 'Robin Alder', role: 'keeper' })
    const link = document.body.querySelector('[data-test="invite-link"] input') as HTMLInputElement
    expect(link.value).toBe(`${window.location.origin}/invitations/abc`)
    expect(document.body.textContent).toContain('Invitation ready')
    expect(document.body.querySelector('.v-overlay--active .v-dialog, .v-dialog.v-overlay--active'), 'the dialog is still open').not.toBeNull()
    wrapper.unmount()
  })

  it('says in the e-mail field when the address is taken, in the team’s words', async () => {
    vi.mocked(createInvitation).mockRejectedValue(
      new ApiError({ status: 409, code: 'email_taken', message: 'Someone already uses this e-mail address', fields: { email: 'already in use' } }),
    )
    const wrapper = await openPeople()
    await wrapper.find('button.v-btn.bg-primary').trigger('click')
    await flushPromises()
    await fillInvite('sam@example.test')
    expect(document.body.querySelector('.v-dialog')!.textContent).toContain('someone with this e-mail is already on the team or invited')
    wrapper.unmount()
  })

  it('explains why the last owner cannot step down, above the list', async () => {
    vi.mocked(updateUser).mockRejectedValue(new ApiError({ status: 409, code: 'last_owner', message: 'The organization must keep at least one active owner' }))
    const wrapper = await openPeople()
    await wrapper.find(`[aria-label="Deactivate ${owner.name}"]`).setValue(false)
    await flushPromises()
    expect(updateUser).toHaveBeenCalledWith(7, { active: false })
    expect(wrapper.find('[role="alert"]').text()).toContain('The team needs at least one active owner. Make someone else an owner first.')
    wrapper.unmount()
  })
})
