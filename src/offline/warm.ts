import type { Router } from 'vue-router'

/** The screens a keeper uses at a tank: their code is fetched while there is a connection, so they open without one. */
const OFFLINE_SCREENS = ['tanks', 'tank', 'tank-test-kit', 'care-today']

export function warmOfflineScreens(router: Router) {
  for (const record of router.getRoutes()) {
    if (typeof record.name !== 'string' || !OFFLINE_SCREENS.includes(record.name)) continue
    const load = record.components?.default
    // A lazy route's component is its loader until first opened.
    if (typeof load === 'function' && !('__vccOpts' in load) && !('setup' in load) && !('render' in load)) {
      void (load as () => Promise<unknown>)().catch(() => undefined)
    }
  }
}
