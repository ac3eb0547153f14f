import { Writable } from 'node:stream'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../server/app'
import { loadConfig } from '../../server/config'
import { createLogger, type LogFormat } from '../../server/platform/logger'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'

// What reaches the log from URLs: secrets in query parameters and path segments are redacted, and
// requests are logged at debug level. Not repeated here: header redaction of Authorization (security-tokens).
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg

beforeAll(async () => {
  t = await startTestApp({ logLevel: 'debug' })
  org = await t.createOrg('Saltmarsh Logs')
})
afterAll(() => t?.close())

/** The app over the test context, logging into memory in the given format. */
function appLogging(format: LogFormat, level = 'debug') {
  const lines: string[] = []
  const sink = new Writable({
    write(chunk, _encoding, done) {
      lines.push(...chunk.toString().split('\n').filter(Boolean))
      done()
    },
  })
  const app = createApp({ ...t.ctx, logger: createLogger(level, { format, destination: sink }) })
  return { api: () => request(app), lines }
}

const WALL_KEY = 'tww_7_Qm9ndXNXYWxsS2V5VGhhdE11c3ROb3RMZWFr'
const ACK_TOKEN = 'ackTOKENmustNOTleak0123456789abcdef'
const INVITE_TOKEN = 'inviteTOKENmustNOTleak0123456789'
const RESET_TOKEN = 'resetTOKENmustNOTleak0123456789'

describe('secrets in URLs never reach the log', () => {
  it('wall keys, acknowledge, invitation, reset and bearer tokens are redacted', async () => {
    const { api, lines } = appLogging('json')
    const jwt = org.users.owner.token
    await api().get(`/wall/7?key=${WALL_KEY}`)
    await api().get(`/api/v1/ack-links/${ACK_TOKEN}`)
    await api().get(`/api/v1/invitations/${INVITE_TOKEN}`)
    await api().get(`/reset-password?token=${RESET_TOKEN}`)
    await api().get(`/ack?token=${ACK_TOKEN}&x=1`)
    await api().get(`/api/v1/auth/me?access_token=${jwt}`)
    await api()
      .get(`/api/v1/tanks/${encodeURIComponent(WALL_KEY)}`)
      .set(bearer(jwt))
    const text = lines.join('\n')
    for (const secret of [WALL_KEY, ACK_TOKEN, INVITE_TOKEN, RESET_TOKEN, jwt, jwt.split('.')[2]!]) expect(text).not.toContain(secret)
    const urls = lines
      .map((l) => JSON.parse(l))
      .filter((l) => l.req)
      .map((l) => l.req.url)
    expect(urls).toEqual([
      '/wall/7?key=[redacted]',
      '/api/v1/ack-links/[redacted]',
      '/api/v1/invitations/[redacted]',
      '/reset-password?token=[redacted]',
      '/ack?token=[redacted]&x=1',
      '/api/v1/auth/me?access_token=[redacted]',
      '/api/v1/tanks/[redacted]',
    ])
  })

  it('the literal routes beside secret segments stay readable', async () => {
    const { api, lines } = appLogging('json')
    await api().post('/api/v1/ack-links/use').send({})
    await api().post('/api/v1/invitations/accept').send({})
    expect(lines.map((l) => JSON.parse(l).req?.url)).toEqual(['/api/v1/ack-links/use', '/api/v1/invitations/accept'])
  })
})

describe('request lines', () => {
  it('are debug level: not shown at the default info level', async () => {
    const quiet = appLogging('json', 'info')
    await quiet.api().get('/api/v1/auth/me').set(bearer(org.users.owner.token))
    expect(quiet.lines).toEqual([])
    const loud = appLogging('json', 'debug')
    await loud.api().get('/api/v1/auth/me').set(bearer(org.users.owner.token))
    expect(loud.lines.map((l) => JSON.parse(l).level)).toEqual([20])
  })

  it('pretty: one short line a person can read, with no headers', async () => {
    const { api, lines } = appLogging('pretty')
    await api().get(`/wall/7?key=${WALL_KEY}`).set('Cookie', 'session=abc')
    expect(lines).toHaveLength(1)
    expect(lines[0]).toMatch(/^\[\d\d:\d\d:\d\d\] DEBUG: GET \/wall\/7\?key=\[redacted\] 404 \d+ ms/)
    expect(lines[0]).not.toContain('{')
    expect(lines[0]).not.toContain('session=abc')
  })
})

describe('configuration', () => {
  const base = { DATABASE_URL: 'postgres://u@127.0.0.1/db', JWT_SECRET: 'x'.repeat(40) }
  it('pretty under development, JSON elsewhere, LOG_FORMAT decides when set', () => {
    expect(loadConfig({ ...base, NODE_ENV: 'development' }).logFormat).toBe('pretty')
    expect(loadConfig({ ...base, NODE_ENV: 'production' }).logFormat).toBe('json')
    expect(loadConfig({ ...base, NODE_ENV: 'development', LOG_FORMAT: 'json' }).logFormat).toBe('json')
  })

  it('TRUST_PROXY: off by default; a hop count or a list; never "everyone"', () => {
    expect(loadConfig(base).trustProxy).toBe(false)
    expect(loadConfig({ ...base, TRUST_PROXY: '1' }).trustProxy).toBe(1)
    expect(loadConfig({ ...base, TRUST_PROXY: 'loopback, 10.0.0.0/8' }).trustProxy).toEqual(['loopback', '10.0.0.0/8'])
    expect(() => loadConfig({ ...base, TRUST_PROXY: 'true' })).toThrow(/TRUST_PROXY: name the proxy/)
  })
})
