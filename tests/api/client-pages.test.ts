import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs'
import { brotliCompressSync, gzipSync } from 'node:zlib'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../server/app'
import { startTestApp } from '../helpers/app'

// The address `npm start` prints is the root: it must open the client, while unknown API paths and
// missing files stay 404s that say so.
describe('the built client behind the API', () => {
  let t: Awaited<ReturnType<typeof startTestApp>>
  let app: ReturnType<typeof createApp>
  const dist = mkdtempSync(join(tmpdir(), 'tw-dist-'))
  const page = '<!doctype html><title>Tankwarden page</title>'
  const SCRIPT = `console.log(${JSON.stringify('the wall '.repeat(400))})`

  beforeAll(async () => {
    writeFileSync(join(dist, 'index.html'), page)
    mkdirSync(join(dist, 'assets'))
    writeFileSync(join(dist, 'assets', 'app-1.js'), 'console.log(1)')
    // The build writes brotli and gzip copies beside each text file (vite.config.ts).
    writeFileSync(join(dist, 'assets', 'app-2.js'), SCRIPT)
    writeFileSync(join(dist, 'assets', 'app-2.js.br'), brotliCompressSync(SCRIPT))
    writeFileSync(join(dist, 'assets', 'app-2.js.gz'), gzipSync(SCRIPT))
    t = await startTestApp({ serveClient: true })
    app = createApp(t.ctx, { clientDir: dist })
  })
  afterAll(async () => {
    await t.close()
    rmSync(dist, { recursive: true, force: true })
  })

  it.each(['/', '/tanks', '/tanks/12', '/wall/1', '/reset-password'])('GET %s answers the client page', async (path) => {
    const res = await request(app).get(path)
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toMatch(/text\/html/)
    expect(res.text).toBe(page)
  })

  it('serves the built files themselves', async () => {
    const res = await request(app).get('/assets/app-1.js')
    expect(res.status).toBe(200)
    expect(res.text).toBe('console.log(1)')
  })

  it.each([
    ['br, gzip, deflate', 'br'],
    ['gzip, deflate', 'gzip'],
  ])('sends a built file compressed to a browser that accepts %s: Content-Encoding %s', async (accept, encoding) => {
    const res = await request(app)
      .get('/assets/app-2.js')
      .set('Accept-Encoding', accept)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(res.status).toBe(200)
    expect(res.headers['content-encoding']).toBe(encoding)
    expect(res.headers['content-type']).toMatch(/^(text|application)\/javascript/)
    expect(res.headers.vary).toMatch(/Accept-Encoding/)
    // supertest decodes gzip itself; brotli arrives as sent. Either way the file is the script.
    expect(Number(res.headers['content-length'])).toBeLessThan(SCRIPT.length / 10)
  })

  it('sends the plain file to a client that accepts no compression', async () => {
    const res = await request(app).get('/assets/app-2.js').set('Accept-Encoding', 'identity')
    expect(res.status).toBe(200)
    expect(res.headers['content-encoding']).toBeUndefined()
    expect(res.text).toBe(SCRIPT)
  })

  it.each(['/favicon.ico', '/assets/missing-2.js', '/robots.txt'])('GET %s, a file that is not there, is a 404', async (path) => {
    const res = await request(app).get(path)
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe('not_found')
  })

  it('an unknown API path stays a JSON 404', async () => {
    const res = await request(app).get('/api/v1/no-such-thing')
    expect(res.status).toBe(404)
    expect(res.headers['content-type']).toMatch(/application\/json/)
    expect(res.body.error).toEqual({ code: 'not_found', message: 'No such endpoint: GET /api/v1/no-such-thing' })
  })

  it('without a built client the root is a JSON 404, not a crash', async () => {
    const bare = createApp(t.ctx, { clientDir: join(dist, 'nowhere') })
    const res = await request(bare).get('/')
    expect(res.status).toBe(404)
    expect(res.body.error.code).toBe('not_found')
  })
})
