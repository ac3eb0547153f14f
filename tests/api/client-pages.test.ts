import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs'
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

  beforeAll(async () => {
    writeFileSync(join(dist, 'index.html'), page)
    mkdirSync(join(dist, 'assets'))
    writeFileSync(join(dist, 'assets', 'app-1.js'), 'console.log(1)')
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
