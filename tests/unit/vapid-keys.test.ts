import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, describe, expect, it } from 'vitest'
import { loadConfig, testConfig } from '../../server/config'
import { vapidKeysFor } from '../../server/push/vapid'

const folders: string[] = []
const dataDir = () => {
  const dir = mkdtempSync(join(tmpdir(), 'tw-vapid-'))
  folders.push(dir)
  return dir
}
afterEach(() => {
  for (const dir of folders.splice(0)) rmSync(dir, { recursive: true, force: true })
})

describe('the Web Push key pair', () => {
  it('is made once into the data folder, readable by its owner only, and the same at the next start', () => {
    const dir = dataDir()
    const first = vapidKeysFor({ config: testConfig({ databaseUrl: 'postgres://unused', dataDir: dir }) })
    // RFC 8292 §3.2: the public key is an uncompressed P-256 point, 65 bytes, base64url.
    expect(Buffer.from(first.publicKey, 'base64url')).toHaveLength(65)
    expect(Buffer.from(first.privateKey, 'base64url')).toHaveLength(32)
    const file = join(dir, 'vapid-keys.json')
    expect(JSON.parse(readFileSync(file, 'utf8'))).toEqual({ publicKey: first.publicKey, privateKey: first.privateKey })
    expect(statSync(file).mode & 0o777).toBe(0o600)
    const again = vapidKeysFor({ config: testConfig({ databaseUrl: 'postgres://unused', dataDir: dir }) })
    expect(again).toEqual(first)
  })

  it('comes from the configuration when given, with the subject from the mail sender unless named', () => {
    const keys = vapidKeysFor({ config: testConfig({ databaseUrl: 'postgres://unused', dataDir: dataDir() }) })
    const env = { DATABASE_URL: 'postgres://u@h/db', JWT_SECRET: 'x'.repeat(40), DATA_DIR: dataDir(), MAIL_FROM: 'Fish Room <alerts@shop.example>' }
    expect(loadConfig({ ...env, VAPID_PUBLIC_KEY: keys.publicKey, VAPID_PRIVATE_KEY: keys.privateKey }).push).toEqual({
      subject: 'mailto:alerts@shop.example',
      publicKey: keys.publicKey,
      privateKey: keys.privateKey,
    })
    expect(loadConfig({ ...env, VAPID_SUBJECT: 'https://shop.example/contact' }).push.subject).toBe('https://shop.example/contact')
    expect(() => loadConfig({ ...env, VAPID_PUBLIC_KEY: keys.publicKey })).toThrow(/set both VAPID keys or neither/)
    expect(() => loadConfig({ ...env, VAPID_SUBJECT: 'alerts@shop.example' })).toThrow(/VAPID_SUBJECT must be a mailto: address or an https:\/\/ URL/)
  })
})
