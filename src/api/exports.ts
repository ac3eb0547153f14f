import type { ExportKind, RestoreSummary } from '@shared/schemas/exports'
import { http } from './client'
import { notifyUnauthorized } from './session'
import { ApiError, isApiErrorBody } from './errors'
import { fileNameOf, saveFile } from './save-file'

export type ExportScope = 'tank' | 'site'

/** A failed download still answers a Blob; the error body is read out of it. */
async function errorFromBlob(status: number, data: Blob): Promise<ApiError> {
  try {
    const body: unknown = JSON.parse(await data.text())
    if (isApiErrorBody(body)) return new ApiError({ status, ...body.error })
  } catch {
    // Not JSON: described by its status below.
  }
  return new ApiError({ status, code: `http_${status}`, message: `The server answered ${status}` })
}

async function download(path: string, params: Record<string, string>, fallback: string): Promise<string> {
  // Every status is taken as an answer here, so the error body in the Blob can be read.
  const res = await http.get<Blob>(path, { params, responseType: 'blob', timeout: 0, validateStatus: () => true })
  if (res.status >= 400) {
    const error = await errorFromBlob(res.status, res.data)
    if (error.status === 401) notifyUnauthorized()
    throw error
  }
  const fileName = fileNameOf(res.headers['content-disposition'], fallback)
  saveFile(res.data, fileName)
  return fileName
}

export function downloadCsv(scope: ExportScope, id: number, kind: ExportKind, from: Date, to: Date): Promise<string> {
  return download(`/${scope}s/${id}/exports/${kind}.csv`, { from: from.toISOString(), to: to.toISOString() }, `${kind}.csv`)
}

export function downloadBackup(): Promise<string> {
  return download('/backup', {}, 'tankwarden-backup.json')
}

export async function restoreBackup(file: File, onProgress?: (fraction: number) => void): Promise<RestoreSummary> {
  const form = new FormData()
  form.append('file', file)
  const res = await http.post<RestoreSummary>('/backup/restore', form, {
    timeout: 0,
    onUploadProgress: (event) => onProgress?.(event.total ? event.loaded / event.total : 0),
  })
  return res.data
}
