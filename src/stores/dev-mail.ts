import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import * as devMailApi from '@/api/dev-mail'

/** Whether this server runs the local test mailbox; asked once per session, for the owner's menu. */
export const useDevMailStore = defineStore('devMail', () => {
  const available = ref<boolean | null>(null)
  let asking: Promise<void> | null = null

  function check(): Promise<void> {
    if (available.value != null) return Promise.resolve()
    asking ??= devMailApi
      .listMail()
      .then((items) => {
        available.value = items != null
      })
      .catch(() => {
        // Unknown for now; the next page that asks tries again.
      })
      .finally(() => {
        asking = null
      })
    return asking
  }

  function $reset() {
    available.value = null
  }

  return { available, check, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useDevMailStore, import.meta.hot))
