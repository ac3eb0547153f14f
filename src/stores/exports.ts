import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { ExportKind, RestoreSummary } from '@shared/schemas/exports'
import { downloadBackup, downloadCsv, restoreBackup, type ExportScope } from '@/api/exports'

/** Downloads in progress and the last restore, so a second click does not start a second download. */
export const useExportsStore = defineStore('exports', () => {
  const running = ref(new Set<string>())
  const restoreProgress = ref<number | null>(null)
  const lastRestore = ref<RestoreSummary | null>(null)

  async function track<T>(key: string, work: () => Promise<T>): Promise<T> {
    running.value = new Set(running.value).add(key)
    try {
      return await work()
    } finally {
      const next = new Set(running.value)
      next.delete(key)
      running.value = next
    }
  }

  return {
    running,
    restoreProgress,
    lastRestore,
    isRunning: (key: string) => running.value.has(key),
    csv(scope: ExportScope, id: number, kind: ExportKind, from: Date, to: Date) {
      return track(`${scope}:${id}:${kind}`, () => downloadCsv(scope, id, kind, from, to))
    },
    backup() {
      return track('backup', downloadBackup)
    },
    async restore(file: File) {
      restoreProgress.value = 0
      try {
        lastRestore.value = await track('restore', () => restoreBackup(file, (fraction) => (restoreProgress.value = fraction)))
        return lastRestore.value
      } finally {
        restoreProgress.value = null
      }
    },
    $reset() {
      running.value = new Set()
      restoreProgress.value = null
      lastRestore.value = null
    },
  }
})
