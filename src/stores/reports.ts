import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { Report, ReportSchedule, ReportScheduleBody, ReportScheduleUpdateBody } from '@shared/schemas/reports'
import * as reportsApi from '@/api/reports'
import type { ReportRequest } from '@/api/reports'
import { saveFile } from '@/api/save-file'

export const useReportsStore = defineStore('reports', () => {
  const report = ref<Report | null>(null)
  const loading = ref(false)
  const schedules = ref<ReportSchedule[]>([])
  // Only the newest request may write: stepping back two periods quickly must not show the first.
  let ticket = 0

  async function load(request: ReportRequest) {
    const mine = ++ticket
    loading.value = true
    try {
      const next = await reportsApi.getReport(request)
      if (mine === ticket) report.value = next
    } finally {
      if (mine === ticket) loading.value = false
    }
  }

  /** Fetches the PDF and hands it to the browser as a download. */
  async function downloadPdf(request: ReportRequest) {
    const { blob, filename } = await reportsApi.getReportPdf(request)
    saveFile(blob, filename)
    return filename
  }

  async function loadSchedules() {
    schedules.value = await reportsApi.listReportSchedules()
  }
  async function createSchedule(input: ReportScheduleBody) {
    const created = await reportsApi.createReportSchedule(input)
    schedules.value = [...schedules.value, created]
    return created
  }
  async function updateSchedule(id: number, changes: ReportScheduleUpdateBody) {
    const updated = await reportsApi.updateReportSchedule(id, changes)
    schedules.value = schedules.value.map((s) => (s.id === id ? updated : s))
  }
  async function deleteSchedule(id: number) {
    await reportsApi.deleteReportSchedule(id)
    schedules.value = schedules.value.filter((s) => s.id !== id)
  }
  const sendNow = (id: number) => reportsApi.sendReportNow(id)

  function $reset() {
    ticket++
    report.value = null
    loading.value = false
    schedules.value = []
  }

  return { report, loading, schedules, load, downloadPdf, loadSchedules, createSchedule, updateSchedule, deleteSchedule, sendNow, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useReportsStore, import.meta.hot))
