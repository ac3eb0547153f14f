import type { ImportSourceSummary, PublicImportJob, StartImportInput } from '@shared/schemas/imports'
import { http } from './client'

export type ImportScope = { kind: 'tank' | 'site'; id: number }

export async function uploadCsv(scope: ImportScope, file: File, sourceName: string | null, onProgress?: (fraction: number) => void): Promise<PublicImportJob> {
  const form = new FormData()
  if (sourceName) form.append('sourceName', sourceName)
  form.append('file', file)
  const path = scope.kind === 'tank' ? `/tanks/${scope.id}/imports` : `/sites/${scope.id}/imports`
  return (await http.post<PublicImportJob>(path, form, { onUploadProgress: (e) => e.total && onProgress?.(e.loaded / e.total) })).data
}

export async function getImport(id: number): Promise<PublicImportJob> {
  return (await http.get<PublicImportJob>(`/imports/${id}`)).data
}

export async function startImport(id: number, input: StartImportInput): Promise<PublicImportJob> {
  return (await http.post<PublicImportJob>(`/imports/${id}/start`, input)).data
}

export async function cancelImport(id: number): Promise<PublicImportJob> {
  return (await http.post<PublicImportJob>(`/imports/${id}/cancel`)).data
}

export async function downloadRejections(id: number): Promise<Blob> {
  return (await http.get<Blob>(`/imports/${id}/rejections`, { responseType: 'blob' })).data
}

export async function listImportSources(): Promise<{ maxUploadMb: number; sources: ImportSourceSummary[] }> {
  return (await http.get<{ maxUploadMb: number; sources: ImportSourceSummary[] }>('/import-sources')).data
}
