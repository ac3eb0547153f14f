import type { RouteRecordRaw } from 'vue-router'
import type { Role } from '@shared/schemas/auth'

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean
    /** Only these roles may open the route; absent means every signed-in role. */
    roles?: Role[]
    title?: string
    /** A full-screen page without the app's chrome. */
    wall?: boolean
  }
}

const EDITORS: Role[] = ['owner', 'keeper']

export const routes: RouteRecordRaw[] = [
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { public: true, title: 'Sign in' },
  },
  {
    // Only while no business exists; the guard sends everyone else to sign in.
    path: '/setup',
    name: 'setup',
    component: () => import('@/views/SetupView.vue'),
    meta: { public: true, title: 'Set up your business' },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { public: true, title: 'Forgot password' },
  },
  {
    // The link in a password reset e-mail.
    path: '/reset-password',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { public: true, title: 'Choose a new password' },
  },
  {
    path: '/accept-invite',
    name: 'accept-invite',
    component: () => import('@/views/AcceptInviteView.vue'),
    meta: { public: true, title: 'Join your team' },
  },
  {
    // Opened from an alert e-mail, often on a phone without a session: it works without one.
    path: '/ack',
    name: 'ack',
    component: () => import('@/views/AckLinkView.vue'),
    meta: { public: true, title: 'Acknowledge' },
  },
  {
    path: '/wall/:siteId(\\d+)',
    name: 'wall',
    component: () => import('@/views/WallView.vue'),
    props: (route) => ({ siteId: Number(route.params.siteId) }),
    meta: { wall: true, title: 'Wall' },
  },
  {
    path: '/',
    component: () => import('@/components/layout/AppShell.vue'),
    children: [
      // Owners' and keepers' home; a viewer is sent on to the tanks list by the role guard.
      { path: '', name: 'overview', component: () => import('@/views/OverviewView.vue'), meta: { title: 'Overview', roles: EDITORS } },
      { path: 'tanks', name: 'tanks', component: () => import('@/views/TanksView.vue'), meta: { title: 'Tanks' } },
      {
        path: 'tanks/new',
        name: 'tank-new',
        component: () => import('@/views/TankEditView.vue'),
        meta: { title: 'New tank', roles: EDITORS },
      },
      {
        path: 'tanks/:id(\\d+)',
        name: 'tank',
        component: () => import('@/views/TankView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Tank' },
      },
      {
        path: 'tanks/:id(\\d+)/test-kit',
        name: 'tank-test-kit',
        component: () => import('@/views/TestKitView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Log test', roles: EDITORS },
      },
      {
        path: 'tanks/:id(\\d+)/build',
        name: 'tank-build',
        component: () => import('@/views/TankBuildView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Build' },
      },
      {
        path: 'tanks/:id(\\d+)/edit',
        name: 'tank-edit',
        component: () => import('@/views/TankEditView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Edit tank', roles: EDITORS },
      },
      { path: 'reports', name: 'report', component: () => import('@/views/ReportView.vue'), meta: { title: 'Report' } },
      {
        path: 'import',
        name: 'import',
        component: () => import('@/views/ImportView.vue'),
        meta: { title: 'Import readings', roles: EDITORS },
      },
      { path: 'clients', name: 'clients', component: () => import('@/views/ClientsView.vue'), meta: { title: 'Clients', roles: EDITORS } },
      {
        path: 'clients/:id(\\d+)',
        name: 'client',
        component: () => import('@/views/ClientView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Client', roles: EDITORS },
      },
      { path: 'round', name: 'round', component: () => import('@/views/RoundView.vue'), meta: { title: 'My round', roles: EDITORS } },
      { path: 'visits', name: 'visits', component: () => import('@/views/VisitsView.vue'), meta: { title: 'Visits' } },
      {
        path: 'visits/:id(\\d+)',
        name: 'visit',
        component: () => import('@/views/VisitView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Visit' },
      },
      { path: 'sites', name: 'sites', component: () => import('@/views/SitesView.vue'), meta: { title: 'Sites' } },
      {
        path: 'sites/:id(\\d+)/roster',
        name: 'roster',
        component: () => import('@/views/RosterView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Duty roster' },
      },
      {
        path: 'sites/:id(\\d+)/labels',
        name: 'site-labels',
        component: () => import('@/views/SiteLabelsView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Tank labels', roles: ['owner'] },
      },
      { path: 'incidents', name: 'incidents', component: () => import('@/views/IncidentsView.vue'), meta: { title: 'Incidents' } },
      { path: 'care/today', name: 'care-today', component: () => import('@/views/CareTodayView.vue'), meta: { title: 'Care today' } },
      { path: 'livestock', name: 'livestock', component: () => import('@/views/LivestockView.vue'), meta: { title: 'Livestock' } },
      { path: 'supplies', name: 'supplies', component: () => import('@/views/SuppliesView.vue'), meta: { title: 'Supplies' } },
      {
        path: 'incidents/:id(\\d+)',
        name: 'incident',
        component: () => import('@/views/IncidentView.vue'),
        props: (route) => ({ id: Number(route.params.id) }),
        meta: { title: 'Incident' },
      },
      {
        path: 'dev/mail',
        name: 'dev-mail',
        component: () => import('@/views/DevMailView.vue'),
        meta: { title: 'Test mailbox', roles: ['owner'] },
      },
      {
        path: 'users',
        name: 'users',
        component: () => import('@/views/UsersView.vue'),
        meta: { title: 'People', roles: ['owner'] },
      },
      {
        path: 'backup',
        name: 'backup',
        component: () => import('@/views/BackupView.vue'),
        meta: { title: 'Backup', roles: ['owner'] },
      },
      { path: 'account', name: 'account', component: () => import('@/views/AccountView.vue'), meta: { title: 'Account' } },
      {
        path: ':pathMatch(.*)*',
        name: 'not-found',
        component: () => import('@/views/NotFoundView.vue'),
        meta: { title: 'Not found' },
      },
    ],
  },
]
