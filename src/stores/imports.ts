import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { ImportMapping, ImportSourceSummary, PublicImportJob } from '@shared/schemas/imports'
import * as importsApi from '@/api/imports'
import { saveFile } from '@/api/save-file'

const FINISHED = ['done', 'cancelled', 'failed']
const POLL_MS = 500

/** One import at a time on the Import screen: upload, confirm the mapping, follow the job. */
export const useImportsStore = defineStore('imports', () => {
  const job = ref<PublicImportJob | null>(null)
  const sources = ref<ImportSourceSummary[]>([])
  const maxUploadMb = ref<number | null>(null)
  const uploadFraction = ref(0)
  let timer: ReturnType<typeof setTimeout> | null = null

  const finished = computed(() => !!job.value && FINISHED.includes(job.value.status))
  const progress = computed(() => {
    const j = job.value
    if (!j || !j.sizeBytes) return 0
    return Math.min(100, Math.round((j.bytesRead / j.sizeBytes) * 100))
  })

  async function loadSources() {
    const answer = await importsApi.listImportSources()
    sources.value = answer.sources
    maxUploadMb.value = answer.maxUploadMb
  }

  async function upload(scope: importsApi.ImportScope, file: File, sourceName: string | null) {
    stopPolling()
    uploadFraction.value = 0
    job.value = await importsApi.uploadCsv(scope, file, sourceName, (f) => (uploadFraction.value = f))
  }

  async function start(mapping: ImportMapping, sourceName: string | null) {
    if (!job.value) return
    job.value = await importsApi.startImport(job.value.id, { mapping, ...(sourceName ? { sourceName } : {}) })
    poll()
  }

  function poll() {
    stopPolling()
    timer = setTimeout(async () => {
      if (!job.value) return
      try {
        job.value = await importsApi.getImport(job.value.id)
      } catch {
        // A missed poll is retried on the next tick.
      }
      if (!finished.value) poll()
    }, POLL_MS)
  }

  function stopPolling() {
    if (timer) clearTimeout(timer)
    timer = null
  }

  async function cancel() {
    if (!job.value) return
    job.value = await importsApi.cancelImport(job.value.id)
    if (!finished.value) poll()
  }

  async function downloadReport() {
    if (!job.value) return
    const blob = await importsApi.downloadRejections(job.value.id)
    saveFile(blob, `import-${job.value.id}-rejected.csv`)
  }

  function $reset() {
    stopPolling()
    job.value = null
    sources.value = []
    maxUploadMb.value = null
    uploadFraction.value = 0
  }

  return { job, sources, maxUploadMb, uploadFraction, finished, progress, loadSources, upload, start, cancel, downloadReport, stopPolling, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useImportsStore, import.meta.hot))
