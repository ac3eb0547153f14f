import type { Pinia } from 'pinia'
import { resetLiveSocket } from '@/composables/useLiveSocket'
import { useCareStore } from './care'
import { useDevMailStore } from './dev-mail'
import { useExportsStore } from './exports'
import { useLiveStore } from './live'
import { usePhotosStore } from './photos'
import { useReportsStore } from './reports'
import { useSitesStore } from './sites'
import { useTanksStore } from './tanks'
import { useUsersStore } from './users'

/** Forget everything the last person loaded, so the next one never glimpses it. */
export function resetSessionStores(pinia?: Pinia) {
  useSitesStore(pinia).$reset()
  useTanksStore(pinia).$reset()
  useUsersStore(pinia).$reset()
  useLiveStore(pinia).$reset()
  useDevMailStore(pinia).$reset()
  useCareStore(pinia).$reset()
  usePhotosStore(pinia).$reset()
  useReportsStore(pinia).$reset()
  useExportsStore(pinia).$reset()
  resetLiveSocket()
}
