import type { App } from 'vue'
import { createPinia } from 'pinia'
import { vuetify } from './vuetify'
import { router } from '@/router'
import { onUnauthorized } from '@/api/session'
import { useAuthStore } from '@/stores/auth'
import { resetSessionStores } from '@/stores/session-reset'

export function registerPlugins(app: App) {
  const pinia = createPinia()
  app.use(vuetify)
  app.use(pinia)
  app.use(router)

  // An expired or revoked session ends here, whichever request noticed it first.
  onUnauthorized(() => {
    useAuthStore(pinia).clearSession()
    resetSessionStores(pinia)
    const current = router.currentRoute.value
    if (current.meta.public) return
    void router.replace({ name: 'sign-in', query: { redirect: current.fullPath } })
  })
}
