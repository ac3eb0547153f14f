import type { PhotoUpload, PublicPhoto } from '@shared/schemas/photos'
import { http } from './client'

const API_PREFIX = '/api/v1'

export async function listPhotos(tankId: number, range: { from?: Date; to?: Date } = {}): Promise<PublicPhoto[]> {
  const params = { ...(range.from ? { from: range.from.toISOString() } : {}), ...(range.to ? { to: range.to.toISOString() } : {}) }
  return (await http.get<PublicPhoto[]>(`/tanks/${tankId}/photos`, { params })).data
}

export async function uploadPhoto(tankId: number, file: Blob, fields: PhotoUpload = {}, onProgress?: (fraction: number) => void): Promise<PublicPhoto> {
  const form = new FormData()
  if (fields.caption) form.append('caption', fields.caption)
  if (fields.takenAt) form.append('takenAt', fields.takenAt)
  if (fields.careLogEntryId !== undefined) form.append('careLogEntryId', String(fields.careLogEntryId))
  // The server reads the type from the bytes; the name is never used, so none of the user's is sent.
  form.append('photo', file, 'photo')
  const { data } = await http.post<PublicPhoto>(`/tanks/${tankId}/photos`, form, {
    timeout: 120_000,
    onUploadProgress: (event) => onProgress?.(event.total ? event.loaded / event.total : 0),
  })
  return data
}

export async function deletePhoto(id: number): Promise<void> {
  await http.delete(`/photos/${id}`)
}

/**
 * An image through the API with the bearer token, as a Blob: an <img src> cannot send the header,
 * and a token in the URL would end up in logs and history.
 */
export async function fetchPhotoBlob(url: string): Promise<Blob> {
  const path = url.startsWith(API_PREFIX) ? url.slice(API_PREFIX.length) : url
  if (!path.startsWith('/photos/')) throw new Error('Only photo images are loaded this way')
  return (await http.get<Blob>(path, { responseType: 'blob' })).data
}
