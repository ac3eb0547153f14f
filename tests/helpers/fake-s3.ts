import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import S3rver from 's3rver'

/**
 * A local S3-compatible server (s3rver) that the real AWS SDK talks to over HTTP: the hosted service
 * is the only part faked. Its objects are files under a temporary folder.
 */
export async function startFakeS3(bucket = 'tankwarden-photos') {
  const directory = mkdtempSync(join(tmpdir(), 'tankwarden-s3-'))
  const server = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory, configureBuckets: [{ name: bucket }] })
  const { port } = await server.run()
  return {
    bucket,
    directory,
    endpoint: `http://127.0.0.1:${port}`,
    // s3rver accepts exactly these credentials.
    settings: { endpoint: `http://127.0.0.1:${port}`, bucket, region: 'us-east-1', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER', forcePathStyle: true },
    async close() {
      await server.close()
      rmSync(directory, { recursive: true, force: true })
    },
  }
}
