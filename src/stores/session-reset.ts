import { getActivePinia, type Pinia, type PiniaPluginContext, type StoreGeneric } from 'pinia'
import { resetLiveSocket } from '@/composables/useLiveSocket'

const storesOf = new WeakMap<Pinia, Set<StoreGeneric>>()

/**
 * Pinia plugin: every store, when first used, is remembered for the sign-out reset, so a new
 * store cannot be forgotten there. Each store therefore defines `$reset` (setup stores have none
 * of their own) that forgets everything the last person loaded.
 */
export function rememberForSignOut({ pinia, store }: PiniaPluginContext) {
  let stores = storesOf.get(pinia)
  if (!stores) storesOf.set(pinia, (stores = new Set()))
  stores.add(store)
}

/** Forget everything the last person loaded, so the next one never glimpses it. */
export function resetSessionStores(pinia: Pinia | undefined = getActivePinia()) {
  if (pinia) for (const store of storesOf.get(pinia) ?? []) store.$reset()
  resetLiveSocket()
}
