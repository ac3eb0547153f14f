import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createMemoryHistory, createRouter } from 'vue-router'

vi.mock('@/api/auth', () => ({
  signIn: vi.fn(),
  signOut: vi.fn(),
  fetchMe: vi.fn(),
  changePassword: vi.fn(),
  fetchInvitation: vi.fn(),
  acceptInvitation: vi.fn(),
}))

import { WALL_KEY, WALL_SITE_KEY, storedWallSession } from '@/api/session'
import { installGuards } from '@/router'
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
})

describe('wall sessions', () => {
  it('keeps the key from the link and takes it out of the address', async () => {
    const router = appRouter()
    await router.push('/wall/3?key=tww_abcdefghijklmnop')
    expect(router.currentRoute.value.name).toBe('wall')
    expect(router.currentRoute.value.fullPath).toBe('/wall/3')
    expect(localStorage.getItem(WALL_KEY)).toBe('tww_abcdefghijklmnop')
    expect(storedWallSession()).toEqual({ key: 'tww_abcdefghijklmnop', siteId: 3 })
  })

  it.each(['/tanks', '/tanks/5', '/sites', '/users', '/sign-in', '/wall/4', '/no-such-page'])(
    'sends a display without a person back to its own wall from %s',
    async (path) => {
      localStorage.setItem(WALL_KEY, 'tww_abcdefghijklmnop')
      localStorage.setItem(WALL_SITE_KEY, '3')
      const router = appRouter()
      await router.push(path)
      expect(router.currentRoute.value.fullPath).toBe('/wall/3')
    },
  )

  it('sends a signed-out visitor without a key to sign in', async () => {
    const router = appRouter()
    await router.push('/wall/3')
    expect(router.currentRoute.value.name).toBe('sign-in')
  })

  it('lets a signed-in person open any wall and the rest of the app, key or not', async () => {
    localStorage.setItem(WALL_KEY, 'tww_abcdefghijklmnop')
    localStorage.setItem(WALL_SITE_KEY, '3')
    const auth = useAuthStore()
    auth.token = 'token'
    auth.user = userWithRole('keeper')
    const router = appRouter()
    await router.push('/wall/4')
    expect(router.currentRoute.value.fullPath).toBe('/wall/4')
    await router.push('/tanks')
    expect(router.currentRoute.value.name).toBe('tanks')
  })
})
