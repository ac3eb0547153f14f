import type { MetricKey } from '@shared/metrics/registry'
import type { LatestResponse, SeriesResponse, SeriesValues } from '@shared/schemas/series'
import { http } from './client'

export interface SeriesParams {
  metric: MetricKey
  from: Date
  to: Date
  points?: number
  /** `raw`: what devices sent before their calibration corrected it. */
  values?: SeriesValues
}

export async function getSeries(tankId: number, params: SeriesParams): Promise<SeriesResponse> {
  const query: Record<string, string> = {
    metric: params.metric,
    from: params.from.toISOString(),
    to: params.to.toISOString(),
  }
  if (params.points) query.points = String(params.points)
  if (params.values && params.values !== 'corrected') query.values = params.values
  return (await http.get<SeriesResponse>(`/tanks/${tankId}/series`, { params: query })).data
}

export async function getLatest(tankId: number): Promise<LatestResponse> {
  return (await http.get<LatestResponse>(`/tanks/${tankId}/latest`)).data
}
