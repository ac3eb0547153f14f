import { ref } from 'vue'
import { vi } from 'vitest'

// Stands in for vite-plugin-pwa's `virtual:pwa-register/vue` (only the build makes it): the test
// says when a new version is ready and sees what the prompt asked for.
export const needRefresh = ref(false)
export const offlineReady = ref(false)
export const updateServiceWorker = vi.fn(async (_reload?: boolean) => undefined)

export function useRegisterSW() {
  return { needRefresh, offlineReady, updateServiceWorker }
}
