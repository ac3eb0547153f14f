import type { Pinia } from 'pinia'
import { useSitesStore } from './sites'
import { useTanksStore } from './tanks'
import { useUsersStore } from './users'

/** Forget everything the last person loaded, so the next one never glimpses it. */
export function resetSessionStores(pinia?: Pinia) {
  useSitesStore(pinia).$reset()
  useTanksStore(pinia).$reset()
  useUsersStore(pinia).$reset()
}
