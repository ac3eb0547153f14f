import { createRouter, createWebHistory, type RouteLocationNormalized, type Router } from 'vue-router'
import { storeWallSession, storedWallSession } from '@/api/session'
import { requestWallEarly } from '@/api/wall-early'
import { pageTitle } from '@/composables/usePageTitle'
import { fetchSetupState } from '@/api/setup'
import { useAuthStore } from '@/stores/auth'
import { denyWithNotice, settleNotice } from './denied'
import { safeRedirect } from './redirect'
import { routes } from './routes'

export const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
})

/** The wall's data is asked for while its screen's code loads (the largest wait of a display's first visit). */
function openingWall(to: RouteLocationNormalized, from: RouteLocationNormalized): true {
  if (from.name !== 'wall' || from.params.siteId !== to.params.siteId) requestWallEarly(Number(to.params.siteId))
  return true
}

export function installGuards(target: Router) {
  target.beforeEach(async (to, from) => {
    // A wall link carries its display key once: keep it, and take it out of the address bar.
    const linkKey = to.name === 'wall' ? to.query.key : undefined
    if (typeof linkKey === 'string' && linkKey) {
      storeWallSession({ key: linkKey, siteId: Number(to.params.siteId) })
      const query = { ...to.query }
      delete query.key
      return { name: 'wall', params: to.params, query, hash: to.hash, replace: true }
    }

    const auth = useAuthStore()
    await auth.restore()

    // A display without a person signed in sees its own wall and nothing else (an alert mail's
    // acknowledge link aside: it carries its own secret and shows only that one incident).
    const wall = storedWallSession()
    if (!auth.isSignedIn && wall && to.name !== 'ack') {
      if (to.name === 'wall' && Number(to.params.siteId) === wall.siteId) return openingWall(to, from)
      return { name: 'wall', params: { siteId: String(wall.siteId) }, replace: true }
    }

    if (to.meta.public) {
      // A signed-in person opening the sign-in page goes straight on.
      if (to.name === 'sign-in' && auth.isSignedIn) return safeRedirect(to.query.redirect) ?? { name: 'overview' }
      // An installation without a business opens its setup page, and only then.
      if (to.name === 'sign-in' && (await setupNeeded())) return { name: 'setup', replace: true }
      if (to.name === 'setup' && (auth.isSignedIn || !(await setupNeeded()))) return { name: auth.isSignedIn ? 'overview' : 'sign-in', replace: true }
      return true
    }
    if (!auth.isSignedIn) return { name: 'sign-in', query: { redirect: to.fullPath } }
    if (to.meta.roles && (!auth.role || !to.meta.roles.includes(auth.role))) {
      // The overview is everyone's first stop after signing in; a viewer's is the tanks list, unexplained.
      if (to.name !== 'overview') denyWithNotice(to.meta.title, to.meta.roles, auth.role)
      return { name: 'tanks' }
    }
    return to.name === 'wall' ? openingWall(to, from) : true
  })

  target.afterEach((to, from, failure) => {
    if (!failure) {
      settleNotice()
      // Within one page (a hash, a filter in the query) the title the page gave itself stays.
      if (to.path !== from.path || to.name !== from.name) document.title = pageTitle(to.meta.title)
      sessionStorage.removeItem(CHUNK_RELOAD_KEY)
    }
  })

  // After a deploy the old lazy chunks are gone; one full reload fetches the new ones.
  target.onError((error: unknown, to) => {
    if (!isChunkLoadError(error)) return
    if (sessionStorage.getItem(CHUNK_RELOAD_KEY)) return
    sessionStorage.setItem(CHUNK_RELOAD_KEY, String(Date.now()))
    window.location.assign(to.fullPath)
  })
}

const CHUNK_RELOAD_KEY = 'tw.chunkReload'

async function setupNeeded(): Promise<boolean> {
  try {
    return (await fetchSetupState()).needed
  } catch {
    // An unreachable server is the sign-in page's to explain.
    return false
  }
}

export function isChunkLoadError(error: unknown): boolean {
  const message = error instanceof Error ? error.message : String(error)
  return /Failed to fetch dynamically imported module|error loading dynamically imported module|Importing a module script failed|Unable to preload CSS/i.test(
    message,
  )
}

installGuards(router)
