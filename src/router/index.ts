import { createRouter, createWebHistory, type Router } from 'vue-router'
import { useAuthStore } from '@/stores/auth'
import { safeRedirect } from './redirect'
import { routes } from './routes'

export const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
})

export function installGuards(target: Router) {
  target.beforeEach(async (to) => {
    const auth = useAuthStore()
    await auth.restore()

    if (to.meta.public) {
      // A signed-in person opening the sign-in page goes straight on.
      if (to.name === 'sign-in' && auth.isSignedIn) return safeRedirect(to.query.redirect) ?? { name: 'tanks' }
      return true
    }
    if (!auth.isSignedIn) return { name: 'sign-in', query: { redirect: to.fullPath } }
    if (to.meta.roles && (!auth.role || !to.meta.roles.includes(auth.role))) return { name: 'tanks' }
    return true
  })

  target.afterEach((to, _from, failure) => {
    if (!failure) {
      document.title = to.meta.title ? `${to.meta.title} · Tankwarden` : 'Tankwarden'
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

export function isChunkLoadError(error: unknown): boolean {
  const message = error instanceof Error ? error.message : String(error)
  return /Failed to fetch dynamically imported module|error loading dynamically imported module|Importing a module script failed|Unable to preload CSS/i.test(
    message,
  )
}

installGuards(router)
