import { mount } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, nextTick, ref } from 'vue'
import { createMemoryHistory, createRouter, RouterView, type RouteRecordRaw } from 'vue-router'

vi.mock('@/api/auth', () => ({
  signIn: vi.fn(),
  signOut: vi.fn(),
  fetchMe: vi.fn(),
  changePassword: vi.fn(),
  fetchInvitation: vi.fn(),
  acceptInvitation: vi.fn(),
}))

import { installGuards } from '@/router'
import { routes } from '@/router/routes'
import { pageTitle, usePageTitle } from '@/composables/usePageTitle'
import { useAuthStore } from '@/stores/auth'
import { userWithRole } from './mount'

/** Stands in for a view whose named thing arrives after its first render. */
const loadedName = ref<string | null>(null)
const Named = defineComponent({
  setup() {
    usePageTitle(() => loadedName.value)
    return () => h('div')
  },
})
const Blank = defineComponent({ render: () => h('div') })

function withViews(records: RouteRecordRaw[]): RouteRecordRaw[] {
  return records.map((record) => {
    if ('redirect' in record && record.redirect) return record
    const component = record.name === 'tank' ? Named : record.children ? defineComponent({ render: () => h(RouterView) }) : Blank
    return { ...record, component, children: record.children ? withViews(record.children) : undefined } as RouteRecordRaw
  })
}

const mounted: Array<{ unmount(): void }> = []
afterEach(() => mounted.splice(0).forEach((wrapper) => wrapper.unmount()))

async function app() {
  const router = createRouter({ history: createMemoryHistory(), routes: withViews(routes) })
  installGuards(router)
  const host = defineComponent({ render: () => h(RouterView) })
  mounted.push(mount(host, { global: { plugins: [router] } }))
  // The first navigation (to /, which sends a viewer on to the tanks) finishes before the test's own.
  await router.isReady()
  return router
}

beforeEach(() => {
  setActivePinia(createPinia())
  const auth = useAuthStore()
  auth.token = 'token'
  auth.user = userWithRole('viewer')
  loadedName.value = null
  document.title = ''
})

describe('page titles', () => {
  it('formats a name with the product after it', () => {
    expect(pageTitle('Reef 2')).toBe('Reef 2 · Tankwarden')
    expect(pageTitle(null)).toBe('Tankwarden')
  })

  it("shows the route's title until the page has loaded its thing, then the thing's name", async () => {
    const router = await app()
    await router.push('/tanks')
    expect(document.title).toBe('Tanks · Tankwarden')
    await router.push('/tanks/7')
    await nextTick()
    expect(document.title).toBe('Tank · Tankwarden')
    loadedName.value = 'Reef 2'
    await nextTick()
    expect(document.title).toBe('Reef 2 · Tankwarden')
  })

  it('keeps the name through a jump within the page, and gives it up on leaving', async () => {
    const router = await app()
    loadedName.value = 'Reef 2'
    await router.push('/tanks/7')
    await nextTick()
    expect(document.title).toBe('Reef 2 · Tankwarden')
    await router.push('/tanks/7#devices')
    expect(document.title).toBe('Reef 2 · Tankwarden')
    await router.push('/incidents')
    await nextTick()
    expect(document.title).toBe('Incidents · Tankwarden')
    // A late change to a page no longer shown does not touch the title.
    loadedName.value = 'Reef 3'
    await nextTick()
    expect(document.title).toBe('Incidents · Tankwarden')
  })
})
