import type { ReportPhoto } from '@shared/schemas/reports'
import type { AppContext } from '../context'
import { photosInPeriod as storedPhotos } from '../photos'

/** The photos of a tank taken in [from, to), for the report's photos section (thumbnails). */
export async function photosInPeriod(ctx: AppContext, tankId: number, from: Date, to: Date): Promise<ReportPhoto[]> {
  const photos = await storedPhotos(ctx, tankId, from, to)
  return photos.map((p) => ({ id: p.id, takenAt: p.takenAt, caption: p.caption, url: p.thumbnailUrl }))
}
