import type { ReportPeriodKind } from '@shared/report/period'
import type { Report, ReportSchedule, ReportScheduleBody, ReportScheduleUpdateBody } from '@shared/schemas/reports'
import { http } from './client'

export type ReportSubjectKind = 'tank' | 'site' | 'client'
export type ReportRequest = { kind: ReportSubjectKind; id: number; period: ReportPeriodKind; date?: string }

const base = (r: ReportRequest) => `/${r.kind === 'tank' ? 'tanks' : r.kind === 'site' ? 'sites' : 'clients'}/${r.id}/report`
const query = (r: ReportRequest) => ({ period: r.period, ...(r.date ? { date: r.date } : {}) })

export async function getReport(r: ReportRequest): Promise<Report> {
  return (await http.get<Report>(base(r), { params: query(r) })).data
}

/** The PDF as a Blob plus the file name the server chose. */
export async function getReportPdf(r: ReportRequest): Promise<{ blob: Blob; filename: string }> {
  const res = await http.get<Blob>(`${base(r)}/pdf`, { params: query(r), responseType: 'blob' })
  const disposition = String(res.headers['content-disposition'] ?? '')
  const filename = /filename="([^"]+)"/.exec(disposition)?.[1] ?? 'tankwarden-report.pdf'
  return { blob: res.data, filename }
}

export async function listReportSchedules(): Promise<ReportSchedule[]> {
  return (await http.get<ReportSchedule[]>('/report-schedules')).data
}
export async function createReportSchedule(input: ReportScheduleBody): Promise<ReportSchedule> {
  return (await http.post<ReportSchedule>('/report-schedules', input)).data
}
export async function updateReportSchedule(id: number, changes: ReportScheduleUpdateBody): Promise<ReportSchedule> {
  return (await http.patch<ReportSchedule>(`/report-schedules/${id}`, changes)).data
}
export async function deleteReportSchedule(id: number): Promise<void> {
  await http.delete(`/report-schedules/${id}`)
}
export async function sendReportNow(id: number): Promise<{ queued: number; period: { label: string } }> {
  return (await http.post<{ queued: number; period: { label: string } }>(`/report-schedules/${id}/send-now`)).data
}
