import type { LabelSheetQuery } from '@shared/schemas/labels'
import { http } from './client'
import { fileNameOf } from './save-file'

/** A site's sheet of tank labels as a PDF, with the file name the server chose. */
export async function getLabelSheet(siteId: number, query: LabelSheetQuery): Promise<{ blob: Blob; fileName: string }> {
  const res = await http.get<Blob>(`/sites/${siteId}/labels.pdf`, { params: query, responseType: 'blob' })
  return { blob: res.data, fileName: fileNameOf(res.headers['content-disposition'], 'tank-labels.pdf') }
}
