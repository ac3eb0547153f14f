import type { S3Client } from '@aws-sdk/client-s3'
import type { Readable } from 'node:stream'
import { assertSafeKey, StoredObjectMissing, type PhotoStore } from './photo-store'

export type S3StoreSettings = {
  endpoint?: string
  bucket: string
  region: string
  accessKeyId?: string
  secretAccessKey?: string
  forcePathStyle: boolean
}

// The SDK is loaded when an S3 store is first used: an instance storing photos on disk never pays its ~25 MB.
type Sdk = typeof import('@aws-sdk/client-s3')
let sdk: Promise<Sdk> | null = null
const loadSdk = () => (sdk ??= import('@aws-sdk/client-s3'))

const isMissing = (s3: Sdk, error: unknown) =>
  error instanceof s3.S3ServiceException && (error.$metadata.httpStatusCode === 404 || error.name === 'NoSuchKey' || error.name === 'NotFound')

/** Any S3-compatible service; without explicit keys the SDK's usual credential chain applies. */
export function s3PhotoStore(settings: S3StoreSettings): PhotoStore & { close(): void } {
  let client: S3Client | null = null
  const open = async () => {
    const s3 = await loadSdk()
    client ??= new s3.S3Client({
      region: settings.region,
      endpoint: settings.endpoint,
      forcePathStyle: settings.forcePathStyle,
      ...(settings.accessKeyId && settings.secretAccessKey
        ? { credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey } }
        : {}),
    })
    return { s3, client }
  }
  const Bucket = settings.bucket
  return {
    kind: 's3',
    async put(key, body, contentType) {
      const { s3, client } = await open()
      await client.send(new s3.PutObjectCommand({ Bucket, Key: assertSafeKey(key), Body: body, ContentType: contentType, ContentLength: body.length }))
    },
    async getStream(key) {
      const { s3, client } = await open()
      try {
        const object = await client.send(new s3.GetObjectCommand({ Bucket, Key: assertSafeKey(key) }))
        return object.Body as Readable
      } catch (error) {
        if (isMissing(s3, error)) throw new StoredObjectMissing(key)
        throw error
      }
    },
    async delete(key) {
      const { s3, client } = await open()
      await client.send(new s3.DeleteObjectCommand({ Bucket, Key: assertSafeKey(key) }))
    },
    async exists(key) {
      const { s3, client } = await open()
      try {
        await client.send(new s3.HeadObjectCommand({ Bucket, Key: assertSafeKey(key) }))
        return true
      } catch (error) {
        if (isMissing(s3, error)) return false
        throw error
      }
    },
    close: () => client?.destroy(),
  }
}
