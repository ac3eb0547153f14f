import { mount, type ComponentMountingOptions } from '@vue/test-utils'
import { setActivePinia, type Pinia } from 'pinia'
import { defineComponent, h, type Component } from 'vue'
import { createMemoryHistory, createRouter, type Router } from 'vue-router'
import { createVuetify } from 'vuetify'
import { VApp } from 'vuetify/components'
import type { PublicUser, Role } from '@shared/schemas/auth'
import { createAppPinia } from '@/plugins/pinia'
import { useAuthStore } from '@/stores/auth'

const Blank = defineComponent({ render: () => h('div') })

/** Same route names as the app, with blank pages, so links resolve and pushes can be checked. */
export function testRouter(): Router {
  const names = [
    'sign-in',
    'tanks',
    'tank-new',
    'tank',
    'tank-edit',
    'tank-test-kit',
    'tank-build',
    'sites',
    'users',
    'account',
    'wall',
    'incidents',
    'incident',
    'roster',
    'ack',
    'dev-mail',
    'care-today',
    'report',
    'import',
    'backup',
    'forgot-password',
    'reset-password',
    'overview',
    'setup',
  ]
  const paths: Record<string, string> = {
    'sign-in': '/sign-in',
    tanks: '/tanks',
    'tank-new': '/tanks/new',
    tank: '/tanks/:id',
    'tank-edit': '/tanks/:id/edit',
    'tank-test-kit': '/tanks/:id/test-kit',
    'tank-build': '/tanks/:id/build',
    wall: '/wall/:siteId',
    sites: '/sites',
    users: '/users',
    account: '/account',
    incidents: '/incidents',
    'care-today': '/care/today',
    incident: '/incidents/:id',
    roster: '/sites/:id/roster',
    ack: '/ack',
    'dev-mail': '/dev/mail',
    report: '/reports',
    import: '/import',
    backup: '/backup',
    'forgot-password': '/forgot-password',
    'reset-password': '/reset-password',
    overview: '/',
    setup: '/setup',
  }
  return createRouter({
    history: createMemoryHistory(),
    routes: names.map((name) => ({ name, path: paths[name]!, component: Blank })),
  })
}

export function userWithRole(role: Role): PublicUser {
  return {
    id: 7,
    email: `${role}@example.test`,
    name: `Pat ${role}`,
    role,
    active: true,
    siteIds: [],
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
