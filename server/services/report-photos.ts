import type { ReportPhoto } from '../../shared/schemas/reports'

/**
 * The photos of a tank taken in [from, to), for the report's photos section. Photos are not
 * stored yet, so there are none; this is the one place that will ask the photo store.
 */
export async function photosInPeriod(_tankId: number, _from: Date, _to: Date): Promise<ReportPhoto[]> {
  return []
}
