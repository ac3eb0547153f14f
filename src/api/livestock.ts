import type { BatchDetail, BatchLossBody, BatchMoveBody, BatchMoveResult, BatchOutBody, PublicBatch, StockRow } from '@shared/schemas/livestock'
import { http } from './client'
import { fileNameOf, saveFile } from './save-file'

export type StockGroup = 'tank' | 'site' | 'species'

export async function listBatches(params: { siteId?: number; tankId?: number; status?: 'current' | 'all' } = {}): Promise<PublicBatch[]> {
  return (await http.get<PublicBatch[]>('/livestock/batches', { params })).data
}

export async function getBatch(id: number): Promise<BatchDetail> {
  return (await http.get<BatchDetail>(`/livestock/batches/${id}`)).data
}

/** Rejects with an ApiError `confirm_needed` (details.warnings) when the move needs confirming. */
export async function moveBatch(id: number, input: BatchMoveBody): Promise<BatchMoveResult> {
  return (await http.post<BatchMoveResult>(`/livestock/batches/${id}/move`, input)).data
}

export async function recordBatchLoss(id: number, input: BatchLossBody): Promise<PublicBatch> {
  return (await http.post<PublicBatch>(`/livestock/batches/${id}/losses`, input)).data
}

export async function batchOut(id: number, input: BatchOutBody): Promise<PublicBatch> {
  return (await http.post<PublicBatch>(`/livestock/batches/${id}/out`, input)).data
}

export async function stockCounts(by: StockGroup, siteId?: number): Promise<StockRow[]> {
  return (await http.get<StockRow[]>('/livestock/stock', { params: { by, siteId } })).data
}

/** Saves the stock counts as a CSV file; answers its name. */
export async function downloadStockCsv(by: StockGroup, siteId?: number): Promise<string> {
  const res = await http.get<Blob>('/livestock/stock.csv', { params: { by, siteId }, responseType: 'blob' })
  const fileName = fileNameOf(res.headers['content-disposition'], `stock-by-${by}.csv`)
  saveFile(res.data, fileName)
  return fileName
}
