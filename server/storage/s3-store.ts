import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3'
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

const isMissing = (error: unknown) =>
  error instanceof S3ServiceException && (error.$metadata.httpStatusCode === 404 || error.name === 'NoSuchKey' || error.name === 'NotFound')

/** Any S3-compatible service; without explicit keys the SDK's usual credential chain applies. */
export function s3PhotoStore(settings: S3StoreSettings): PhotoStore & { close(): void } {
  const client = new S3Client({
    region: settings.region,
    endpoint: settings.endpoint,
    forcePathStyle: settings.forcePathStyle,
    ...(settings.accessKeyId && settings.secretAccessKey
      ? { credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey } }
      : {}),
  })
  const Bucket = settings.bucket
  return {
    kind: 's3',
    async put(key, body, contentType) {
      await client.send(new PutObjectCommand({ Bucket, Key: assertSafeKey(key), Body: body, ContentType: contentType, ContentLength: body.length }))
    },
    async getStream(key) {
      try {
        const object = await client.send(new GetObjectCommand({ Bucket, Key: assertSafeKey(key) }))
        return object.Body as Readable
      } catch (error) {
        if (isMissing(error)) throw new StoredObjectMissing(key)
        throw error
      }
    },
    async delete(key) {
      await client.send(new DeleteObjectCommand({ Bucket, Key: assertSafeKey(key) }))
    },
    async exists(key) {
      try {
        await client.send(new HeadObjectCommand({ Bucket, Key: assertSafeKey(key) }))
        return true
      } catch (error) {
        if (isMissing(error)) return false
        throw error
      }
    },
    close: () => client.destroy(),
  }
}
