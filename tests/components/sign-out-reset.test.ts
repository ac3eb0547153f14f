import { flushPromises } from '@vue/test-utils'
import { createPinia, type Pinia, type StoreGeneric } from 'pinia'
import { describe, expect, it, vi } from 'vitest'

vi.mock('@/api/auth', () => ({ signOut: vi.fn(async () => undefined) }))
vi.mock('@/api/sites', () => ({ listSites: vi.fn(async () => []) }))
vi.mock('@/api/dev-mail', () => ({ listMail: vi.fn(async () => null) }))
vi.mock('@/api/push', () => ({ removePushDevice: vi.fn(async () => undefined) }))

import { signOut } from '@/api/auth'
import { removePushDevice } from '@/api/push'
import AppShell from '@/components/layout/AppShell.vue'
import UserMenu from '@/components/layout/UserMenu.vue'
import { mountView } from './mount'

type UseStore = ((pinia?: Pinia) => StoreGeneric) & { $id: string }

// Every store module there is, so a store added later is covered without touching this test.
const storeModules = import.meta.glob<Record<string, unknown>>('../../src/stores/*.ts', { eager: true })
const useStores = Object.values(storeModules)
  .flatMap((module) => Object.values(module))
  .filter((value): value is UseStore => typeof value === 'function' && typeof (value as { $id?: unknown }).$id === 'string')

/** A value of the same kind that no fresh store holds. */
function leftOver(value: unknown): unknown {
  if (Array.isArray(value)) return [...value, { id: 999, name: 'left over' }]
  if (value instanceof Map) return new Map([...value, ['left over', 999]])
  if (value instanceof Set) return new Set([...value, 'left over'])
  if (typeof value === 'number') return value + 999
  if (typeof value === 'boolean') return !value
  if (value && typeof value === 'object') return { ...value, 999: 'left over' }
  return 'left over'
}

describe('signing out', { timeout: 30_000 }, () => {
  it('finds every store of the app', () => {
    expect(useStores.map((useStore) => useStore.$id).sort()).toEqual(
      ['auth', 'care', 'devMail', 'exports', 'imports', 'live', 'photos', 'reports', 'sites', 'tanks', 'users'].sort(),
    )
  })

  it('puts every store back as a fresh one, none forgotten', async () => {
    const fresh = createPinia()
    const expected = new Map(useStores.map((useStore) => [useStore.$id, useStore(fresh).$state]))
    const { wrapper, pinia, router } = await mountView(AppShell, { role: 'owner' })
    await flushPromises()

    for (const useStore of useStores) {
      const store = useStore(pinia)
      store.$patch((state: Record<string, unknown>) => {
        for (const key of Object.keys(state)) state[key] = leftOver(state[key])
      })
      expect(store.$state, useStore.$id).not.toEqual(expected.get(useStore.$id))
    }

    wrapper.findComponent(UserMenu).vm.$emit('sign-out')
    await flushPromises()

    expect(signOut).toHaveBeenCalledTimes(1)
    await vi.waitFor(() => expect(router.currentRoute.value.name).toBe('sign-in'))
    for (const useStore of useStores) expect.soft(useStore(pinia).$state, useStore.$id).toEqual(expected.get(useStore.$id))
  })

  it('removes this browser’s notification device first, so a shared phone stops showing alerts', async () => {
    localStorage.setItem('tankwarden.pushDeviceId', '42')
    const { wrapper } = await mountView(AppShell, { role: 'keeper' })
    await flushPromises()
    vi.mocked(signOut).mockClear()
    wrapper.findComponent(UserMenu).vm.$emit('sign-out')
    await flushPromises()
    expect(removePushDevice).toHaveBeenCalledWith(42)
    expect(vi.mocked(removePushDevice).mock.invocationCallOrder[0]!).toBeLessThan(vi.mocked(signOut).mock.invocationCallOrder[0]!)
    expect(localStorage.getItem('tankwarden.pushDeviceId')).toBeNull()
  })
})
