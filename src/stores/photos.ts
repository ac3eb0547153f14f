import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import * as photosApi from '@/api/photos'
import type { PhotoUpload, PublicPhoto } from '@shared/schemas/photos'

const newestFirst = (a: PublicPhoto, b: PublicPhoto) => Date.parse(b.takenAt) - Date.parse(a.takenAt) || b.id - a.id

/** Each tank's photos, and the object URLs of the images already fetched (revoked on sign-out). */
export const usePhotosStore = defineStore('photos', () => {
  const byTank = ref<Record<number, PublicPhoto[]>>({})
  const objectUrls = new Map<string, Promise<string>>()
  let generation = 0

  async function load(tankId: number) {
    const ticket = generation
    const photos = await photosApi.listPhotos(tankId)
    if (ticket === generation) byTank.value = { ...byTank.value, [tankId]: [...photos].sort(newestFirst) }
    return photos
  }

  async function upload(tankId: number, file: Blob, fields: PhotoUpload = {}, onProgress?: (fraction: number) => void) {
    const photo = await photosApi.uploadPhoto(tankId, file, fields, onProgress)
    byTank.value = { ...byTank.value, [tankId]: [photo, ...(byTank.value[tankId] ?? [])].sort(newestFirst) }
    return photo
  }

  async function remove(photo: PublicPhoto) {
    await photosApi.deletePhoto(photo.id)
    byTank.value = { ...byTank.value, [photo.tankId]: (byTank.value[photo.tankId] ?? []).filter((p) => p.id !== photo.id) }
    for (const url of [photo.display.url, photo.thumbnail.url]) forget(url)
  }

  /** A same-origin blob: URL for an API image URL, fetched once. */
  function objectUrl(url: string): Promise<string> {
    let found = objectUrls.get(url)
    if (!found) {
      found = photosApi.fetchPhotoBlob(url).then((blob) => URL.createObjectURL(blob))
      found.catch(() => objectUrls.delete(url))
      objectUrls.set(url, found)
    }
    return found
  }

  function forget(url: string) {
    const found = objectUrls.get(url)
    objectUrls.delete(url)
    found?.then((objectUrl) => URL.revokeObjectURL(objectUrl)).catch(() => undefined)
  }

  function $reset() {
    generation++
    for (const url of [...objectUrls.keys()]) forget(url)
    byTank.value = {}
  }

  return { byTank, load, upload, remove, objectUrl, $reset }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(usePhotosStore, import.meta.hot))
