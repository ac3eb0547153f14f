import { flushPromises } from '@vue/test-utils'
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest'
import type { PublicPhoto } from '@shared/schemas/photos'

vi.mock('@/api/photos')
vi.mock('@/api/care')

import { listCareLog } from '@/api/care'
import { fetchPhotoBlob, listPhotos } from '@/api/photos'
import PhotoTimeline from '@/components/photos/PhotoTimeline.vue'
import { photosByDay, takenAtGuess } from '@/components/photos/photo-timeline'
import { mountView } from '../mount'

const photo = (id: number, takenAt: string, caption = '', careLogEntryId: number | null = null): PublicPhoto => ({
  id,
  tankId: 12,
  careLogEntryId,
  caption,
  takenAt,
  uploadedBy: { id: 7, name: 'Pat keeper' },
  createdAt: takenAt,
  contentType: 'image/jpeg',
  display: { url: `/api/v1/photos/${id}/image`, width: 1600, height: 1200, bytes: 1000 },
  thumbnail: { url: `/api/v1/photos/${id}/thumbnail`, width: 320, height: 240 },
})
// 23:30 UTC on 3 March is already 4 March in Auckland (UTC+13 in its summer time; NZ Time Act 1974, from memory).
const PHOTOS = [
  photo(1, '2026-03-02T08:00:00.000Z', 'Day one'),
  photo(2, '2026-03-03T23:30:00.000Z', 'Late', 9),
  photo(3, '2026-03-03T10:00:00.000Z', 'Morning'),
]

describe('photosByDay', () => {
  it('groups by the calendar day in the given zone, newest first', () => {
    const label = (iso: string) => iso.slice(0, 10)
    expect(photosByDay(PHOTOS, 'UTC', label).map((d) => [d.day, d.photos.map((p) => p.id)])).toEqual([
      ['2026-03-03', [2, 3]],
      ['2026-03-02', [1]],
    ])
    expect(photosByDay(PHOTOS, 'Pacific/Auckland', label).map((d) => [d.day, d.photos.map((p) => p.id)])).toEqual([
      ['2026-03-04', [2]],
      ['2026-03-03', [3]],
      ['2026-03-02', [1]],
    ])
  })
  it('guesses taken-at from the file time, never in the future', () => {
    const now = Date.parse('2026-03-05T12:00:00Z')
    expect(takenAtGuess(new File(['x'], 'a.jpg', { lastModified: Date.parse('2026-03-01T09:00:00Z') }), now).toISOString()).toBe('2026-03-01T09:00:00.000Z')
    expect(takenAtGuess(new File(['x'], 'a.jpg', { lastModified: now + 86_400_000 }), now).getTime()).toBe(now)
  })
})

describe('PhotoTimeline', () => {
  const created = vi.fn(() => 'blob:probe')
  const original = URL.createObjectURL
  beforeAll(() => {
    URL.createObjectURL = created as unknown as typeof URL.createObjectURL
  })
  afterAll(() => {
    URL.createObjectURL = original
  })
  beforeEach(() => {
    vi.mocked(listPhotos).mockReset()
    vi.mocked(listPhotos).mockResolvedValue(PHOTOS)
    vi.mocked(listCareLog).mockReset()
    vi.mocked(listCareLog).mockResolvedValue([])
    vi.mocked(fetchPhotoBlob).mockReset()
    vi.mocked(fetchPhotoBlob).mockResolvedValue(new Blob(['jpeg bytes'], { type: 'image/jpeg' }))
  })

  it('shows thumbnails under their day, loaded as blobs through the API module, with no upload for a viewer', async () => {
    const { wrapper } = await mountView(PhotoTimeline, { role: 'viewer', props: { tankId: 12, canWrite: false, timeZone: 'UTC' } })
    await flushPromises()
    expect(listPhotos).toHaveBeenCalledWith(12)
    const days = wrapper.findAll('section[data-test^="photo-day-"]')
    expect(days.map((d) => d.attributes('data-test'))).toEqual(['photo-day-2026-03-03', 'photo-day-2026-03-02'])
    expect(days[0]!.find('h3').text()).toBe('Tue 3 Mar 2026')
    expect(days[0]!.findAll('button').map((b) => b.text())).toEqual(['23:30 · Late', '10:00 · Morning'])
    expect(wrapper.find('[data-test="photo-2"] [aria-label="linked to the care log"]').exists()).toBe(true)
    expect(
      vi
        .mocked(fetchPhotoBlob)
        .mock.calls.map((c) => c[0])
        .sort(),
    ).toEqual(['/api/v1/photos/1/thumbnail', '/api/v1/photos/2/thumbnail', '/api/v1/photos/3/thumbnail'])
    expect(wrapper.findAll('[data-test="photo-img"]').map((img) => img.attributes('src'))).toEqual(['blob:probe', 'blob:probe', 'blob:probe'])
    expect(wrapper.find('[data-test="photo-add"]').exists()).toBe(false)
  })

  it('says so when the tank has no photos, and offers the upload to a keeper', async () => {
    vi.mocked(listPhotos).mockResolvedValue([])
    const { wrapper } = await mountView(PhotoTimeline, { role: 'keeper', props: { tankId: 12, canWrite: true, timeZone: 'UTC' } })
    await flushPromises()
    expect(wrapper.find('[data-test="photo-empty"]').text()).toBe('No photos of this tank yet — add one to see how it changes over the weeks.')
    expect(wrapper.find('[data-test="photo-add"]').exists()).toBe(true)
  })
})
