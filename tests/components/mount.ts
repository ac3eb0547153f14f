import { mount, type ComponentMountingOptions } from '@vue/test-utils'
import { setActivePinia, type Pinia } from 'pinia'
import { defineComponent, h, type Component } from 'vue'
import { createMemoryHistory, createRouter, type Router, type RouteRecordRaw } from 'vue-router'
import { createVuetify } from 'vuetify'
import { VApp } from 'vuetify/components'
import type { PublicUser, Role } from '@shared/schemas/auth'
import { createAppPinia } from '@/plugins/pinia'
import { routes } from '@/router/routes'
import { useAuthStore } from '@/stores/auth'

const Blank = defineComponent({ render: () => h('div') })

/** The app's routes with their names, paths and meta, but blank pages instead of lazy views. */
export function blankRoutes(records: RouteRecordRaw[]): RouteRecordRaw[] {
  return records.map((record) => {
    if ('redirect' in record && record.redirect) return record
    return { ...record, component: Blank, children: record.children ? blankRoutes(record.children) : undefined } as RouteRecordRaw
  })
}

/** The app's routes with blank pages and no guards, so links resolve and pushes can be checked. */
export function testRouter(): Router {
  return createRouter({ history: createMemoryHistory(), routes: blankRoutes(routes) })
}

export function userWithRole(role: Role): PublicUser {
  return {
    id: 7,
    email: `${role}@example.test`,
    name: `Pat ${role}`,
    role,
    active: true,
    siteIds: [],
    clientId: null,
    organizationId: 1,
    createdAt: '2025-01-01T00:00:00.000Z',
  }
}

interface MountOptions<P> {
  props?: P
  role?: Role | null
  router?: Router
  /** Where the router starts; `/tanks` unless a page reads its query. */
  path?: string
}

/** Mounts inside a v-app with Vuetify, a fresh Pinia and a memory router. */
export async function mountView<P extends Record<string, unknown>>(component: Component, options: MountOptions<P> = {}) {
  const pinia: Pinia = createAppPinia()
  setActivePinia(pinia)
  if (options.role) {
    const auth = useAuthStore()
    auth.token = 'test-token'
    auth.user = userWithRole(options.role)
    auth.organization = { id: 1, name: 'Harbour Fish Room', clockStyle: '24h' }
  }
  const router = options.router ?? testRouter()
  await router.push(options.path ?? '/tanks')
  await router.isReady()
  const Host = defineComponent({ render: () => h(VApp, () => h(component, options.props ?? {})) })
  const mountOptions: ComponentMountingOptions<typeof Host> = {
    global: { plugins: [createVuetify(), pinia, router] },
    attachTo: document.body,
  }
  const wrapper = mount(Host, mountOptions)
  return { wrapper, router, pinia }
}
