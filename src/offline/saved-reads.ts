import { AxiosError, type AxiosInstance, type AxiosResponse, type InternalAxiosRequestConfig } from 'axios'
import { shallowRef } from 'vue'
import { offlineDb, offlineOwner } from './db'

/**
 * The answers a keeper needs to work on a tank without a connection: the tank, its tasks, its
 * care log and kit entries, its latest values, the sites and Care today. Each is kept as last
 * received; with no connection the same request is answered from it.
 */
const SAVED_PATHS = [/^\/tanks\/\d+$/, /^\/tanks\/\d+\/(care-tasks|care-log|test-kit-entries|latest)$/, /^\/sites$/, /^\/care\/today$/]

/** When the oldest answer now on screen from this phone's storage was received; null when everything is fresh. */
export const shownSavedAt = shallowRef<number | null>(null)

function savedKey(config: InternalAxiosRequestConfig, userId: number): string | null {
  if ((config.method ?? 'get').toLowerCase() !== 'get' || !config.url) return null
  const path = config.url.split('?')[0] as string
  if (!SAVED_PATHS.some((p) => p.test(path))) return null
  // A range counted back from now differs on every call: the last answer for the path stands in for any.
  const kept = Object.entries((config.params ?? {}) as Record<string, string>).filter(([name]) => name !== 'from' && name !== 'to')
  const params = new URLSearchParams(kept.sort(([a], [b]) => a.localeCompare(b)))
  return `${userId}:${path}?${params}`
}

async function remember(response: AxiosResponse) {
  const userId = offlineOwner()
  const key = userId == null ? null : savedKey(response.config, userId)
  if (!key || userId == null) return
  shownSavedAt.value = null
  const db = await offlineDb()
  await db?.put('reads', { key, userId, savedAt: Date.now(), data: response.data }).catch(() => undefined)
}

async function fromSaved(error: unknown): Promise<AxiosResponse> {
  const userId = offlineOwner()
  // Only a request that never got an answer falls back: a 404 or 403 is the server's word.
  if (!(error instanceof AxiosError) || error.response || !error.config || userId == null) throw error
  const key = savedKey(error.config, userId)
  const db = key ? await offlineDb() : null
  const saved = key && db ? await db.get('reads', key).catch(() => undefined) : undefined
  if (!saved) throw error
  shownSavedAt.value = Math.min(shownSavedAt.value ?? saved.savedAt, saved.savedAt)
  return { data: saved.data, status: 200, statusText: 'saved on this device', headers: {}, config: error.config }
}

/** Keeps the answers above and gives them back when the server cannot be reached. Install before the error mapping. */
export function installSavedReads(http: AxiosInstance) {
  http.interceptors.response.use((response) => {
    void remember(response)
    return response
  }, fromSaved)
}

/** A shared phone: the next person must not see what the last one looked at. */
export async function forgetSavedReads(userId: number) {
  const db = await offlineDb()
  if (!db) return
  const keys = await db.getAllKeysFromIndex('reads', 'byUser', userId)
  const tx = db.transaction('reads', 'readwrite')
  await Promise.all([...keys.map((k) => tx.store.delete(k)), tx.done])
}
