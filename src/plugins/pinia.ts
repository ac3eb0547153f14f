import { createPinia } from 'pinia'
import { rememberForSignOut } from '@/stores/session-reset'

/** The app's Pinia: every store registers itself for the sign-out reset (stores/session-reset.ts). */
export function createAppPinia() {
  const pinia = createPinia()
  pinia.use(rememberForSignOut)
  return pinia
}
