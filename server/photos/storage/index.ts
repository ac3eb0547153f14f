import { join } from 'node:path'
import type { Config } from '../../config'
import { localPhotoStore } from './local-store'
import type { PhotoStore } from './photo-store'
import { s3PhotoStore } from './s3-store'

export type { PhotoStore } from './photo-store'
export { StoredObjectMissing } from './photo-store'

// One store per configuration, so every router and service of an app shares one S3 client.
const stores = new WeakMap<Config, PhotoStore>()

export function photoStoreFor(config: Config): PhotoStore {
  let store = stores.get(config)
  if (!store) {
    const settings = config.photos.store
    store = settings.kind === 's3' ? s3PhotoStore(settings) : localPhotoStore(join(config.dataDir, 'photos'))
    stores.set(config, store)
  }
  return store
}
