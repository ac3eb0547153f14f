import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createMemoryHistory, createRouter } from 'vue-router'

vi.mock('@/api/setup', () => ({ fetchSetupState: vi.fn() }))
vi.mock('@/api/auth', () => ({
  signIn: vi.fn(),
  signOut: vi.fn(),
  fetchMe: vi.fn(),
  changePassword: vi.fn(),
  fetchInvitation: vi.fn(),
  acceptInvitation: vi.fn(),
}))

import { fetchMe } from '@/api/auth'
import { fetchSetupState } from '@/api/setup'
import { installGuards, isChunkLoadError } from '@/router'
import { routes } from '@/router/routes'
import { useAuthStore } from '@/stores/auth'
import { blankRoutes, userWithRole } from './mount'

function appRouter() {
  const router = createRouter({ history: createMemoryHistory(), routes: blankRoutes(routes) })
  installGuards(router)
  return router
}

beforeEach(() => {
  setActivePinia(createPinia())
  vi.mocked(fetchMe).mockReset()
  vi.mocked(fetchSetupState).mockReset()
  vi.mocked(fetchSetupState).mockResolvedValue({ needed: false, codeRequired: false })
})

describe('route guards', () => {
  it('sends a signed-out visitor to sign-in with a way back', async () => {
    const router = appRouter()
    await router.push('/tanks/5')
    expect(router.currentRoute.value.name).toBe('sign-in')
    expect(router.currentRoute.value.query.redirect).toBe('/tanks/5')
  })

  it('restores a remembered session before deciding', async () => {
    localStorage.setItem('tw.token', 'remembered')
    vi.mocked(fetchMe).mockResolvedValue({ user: userWithRole('keeper'), organization: { id: 1, name: 'Shop', clockStyle: '24h' } })
    const router = appRouter()
    await router.push('/tanks/new')
    expect(fetchMe).toHaveBeenCalledTimes(1)
    expect(router.currentRoute.value.name).toBe('tank-new')
  })

  it('drops a stale token and asks to sign in', async () => {
    localStorage.setItem('tw.token', 'expired')
    vi.mocked(fetchMe).mockRejectedValue(new Error('401'))
    const router = appRouter()
    await router.push('/sites')
    expect(router.currentRoute.value.name).toBe('sign-in')
    expect(localStorage.getItem('tw.token')).toBeNull()
  })

  it.each([
    ['viewer', '/tanks/new', 'tanks'],
    ['viewer', '/tanks/3/edit', 'tanks'],
    ['keeper', '/users', 'tanks'],
    ['keeper', '/tanks/3/edit', 'tank-edit'],
    ['owner', '/users', 'users'],
    ['keeper', '/dev/mail', 'tanks'],
    ['owner', '/dev/mail', 'dev-mail'],
    ['viewer', '/incidents/4', 'incident'],
    ['viewer', '/sites/3/roster', 'roster'],
  ] as const)('a %s opening %s lands on %s', async (role, path, expected) => {
    const auth = useAuthStore()
    auth.token = 'token'
    auth.user = userWithRole(role)
    const router = appRouter()
    await router.push(path)
    expect(router.currentRoute.value.name).toBe(expected)
  })

  it('opens an acknowledge link without a session, even on a wall display', async () => {
    const router = appRouter()
    await router.push('/ack?token=abcdefghijklmnopqrstuvwxyz')
    expect(router.currentRoute.value.name).toBe('ack')
    localStorage.setItem('tw.wallKey', 'tww_display_key_123')
    localStorage.setItem('tw.wallSiteId', '3')
    await router.push('/ack?token=zyxwvutsrqponmlkjihgfedcba')
    expect(router.currentRoute.value.name).toBe('ack')
    await router.push('/incidents')
    expect(router.currentRoute.value.name).toBe('wall')
  })

  it.each([
    ['viewer', 'tanks'],
    ['keeper', 'overview'],
    ['owner', 'overview'],
  ] as const)('opens / for a %s on %s', async (role, expected) => {
    const auth = useAuthStore()
    auth.token = 'token'
    auth.user = userWithRole(role)
    const router = appRouter()
    await router.push('/')
    expect(router.currentRoute.value.name).toBe(expected)
  })

  it('opens the setup page on an installation without a business, and only then', async () => {
    vi.mocked(fetchSetupState).mockResolvedValue({ needed: true, codeRequired: false })
    const router = appRouter()
    await router.push('/tanks')
    expect(router.currentRoute.value.name).toBe('setup')
    vi.mocked(fetchSetupState).mockResolvedValue({ needed: false, codeRequired: false })
    await router.push('/tanks')
    expect(router.currentRoute.value.name).toBe('sign-in')
    await router.push('/setup')
    expect(router.currentRoute.value.name).toBe('sign-in')
  })

  it('recognises a vanished lazy chunk', () => {
    expect(isChunkLoadError(new TypeError('Failed to fetch dynamically imported module: /assets/TankView-1a2b.js'))).toBe(true)
    expect(isChunkLoadError(new Error('Request failed with status code 500'))).toBe(false)
  })
})
