import type { App } from 'vue'
import { createAppPinia } from './pinia'
import { vuetify } from './vuetify'
import { router } from '@/router'
import { onUnauthorized, storedWallSession } from '@/api/session'
import { useAuthStore } from '@/stores/auth'
import { resetSessionStores } from '@/stores/session-reset'

export function registerPlugins(app: App) {
  const pinia = createAppPinia()
  app.use(vuetify)
  app.use(pinia)
  app.use(router)

  // An expired or revoked session ends here, whichever request noticed it first.
  onUnauthorized(() => {
    const auth = useAuthStore(pinia)
    const personWasSignedIn = auth.token != null
    const current = router.currentRoute.value
    // A display's key that stops working leaves the wall up, saying so, and retrying: signing in
    // is not something a TV can do, and the owner may fix the credential.
    // The wall's data may be asked for before the wall is the current route (src/api/wall-early.ts).
    if (!personWasSignedIn && (current.meta.wall || storedWallSession())) return
    auth.clearSession()
    resetSessionStores(pinia)
    if (current.meta.public) return
    void router.replace({ name: 'sign-in', query: { redirect: current.fullPath } })
  })
}
