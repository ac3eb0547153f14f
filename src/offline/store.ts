import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { discardKept, forgetOutboxState, outboxItems, outboxNotices, refreshOutbox, retryKept, sendWaiting } from './outbox'
import { shownSavedAt } from './saved-reads'

/** How often waiting entries are tried again while the page is open (a phone's `online` event is not always told). */
const RETRY_MS = 30_000

/** The phone's connection as the screens show it: offline or not, what is waiting to be sent, how old the data on screen is. */
export const useOfflineStore = defineStore('offline', () => {
  const online = ref(typeof navigator === 'undefined' ? true : navigator.onLine)
  const items = computed(() => outboxItems.value)
  const waiting = computed(() => items.value.filter((i) => i.state === 'waiting'))
  const refused = computed(() => items.value.filter((i) => i.state === 'refused'))
  const notices = computed(() => outboxNotices.value)
  const savedAt = computed(() => shownSavedAt.value)
  let timer: ReturnType<typeof setInterval> | null = null

  const onOnline = () => {
    online.value = true
    void sendWaiting()
  }
  const onOffline = () => {
    online.value = false
  }

  /** From sign-in on: watch the connection and send what waits. */
  function start() {
    if (timer || typeof window === 'undefined') return
    window.addEventListener('online', onOnline)
    window.addEventListener('offline', onOffline)
    timer = setInterval(() => {
      if (waiting.value.length && navigator.onLine) void sendWaiting()
    }, RETRY_MS)
    void sendWaiting()
  }

  function stop() {
    if (typeof window !== 'undefined') {
      window.removeEventListener('online', onOnline)
      window.removeEventListener('offline', onOffline)
    }
    if (timer) clearInterval(timer)
    timer = null
  }

  const dismissNotice = (index: number) => {
    outboxNotices.value = outboxNotices.value.filter((_, i) => i !== index)
  }

  function $reset() {
    stop()
    forgetOutboxState()
    shownSavedAt.value = null
    online.value = typeof navigator === 'undefined' ? true : navigator.onLine
  }

  return {
    online,
    items,
    waiting,
    refused,
    notices,
    savedAt,
    start,
    stop,
    refresh: refreshOutbox,
    sendNow: sendWaiting,
    discard: discardKept,
    retry: retryKept,
    dismissNotice,
    $reset,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useOfflineStore, import.meta.hot))
