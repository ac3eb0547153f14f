import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import sharp from 'sharp'
import { expect } from 'vitest'
import type { Config } from '../../server/config'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

/** The real app with its photo folder in a fresh temporary DATA_DIR, so the files can be counted. */
export async function startPhotoTestApp(overrides: Partial<Config> = {}) {
  const dataDir = mkdtempSync(join(tmpdir(), 'tankwarden-photos-'))
  const t = await startTestApp({ dataDir, ...overrides })
  return {
    ...t,
    dataDir,
    photoDir: join(dataDir, 'photos'),
    async close() {
      await t.close()
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}
export type PhotoTestApp = Awaited<ReturnType<typeof startPhotoTestApp>>

export const as = (org: TestOrg, role: 'owner' | 'keeper' | 'viewer') => bearer(org.users[role].token)

export async function newTank(t: PhotoTestApp, org: TestOrg, siteId = org.siteIds[0] as number) {
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(as(org, 'owner'))
    .send(sampleTank(siteId, { name: `Photo tank ${Math.random().toString(36).slice(2, 8)}` }))
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.id as number
}

/** Every file under a folder, as paths relative to it (an absent folder holds none). */
export function filesUnder(root: string): string[] {
  const found: string[] = []
  const walk = (dir: string, prefix: string) => {
    let names: string[]
    try {
      names = readdirSync(dir)
    } catch {
      return
    }
    for (const name of names) {
      const path = join(dir, name)
      if (statSync(path).isDirectory()) walk(path, `${prefix}${name}/`)
      else found.push(`${prefix}${name}`)
    }
  }
  walk(root, '')
  return found.sort()
}

/** A test image: a left-to-right gradient, so the pixels differ and the encoder has work to do. */
export async function makeImage(format: 'jpeg' | 'png' | 'webp' | 'gif' | 'tiff', width: number, height: number) {
  const raw = Buffer.alloc(width * height * 3)
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 3
      raw[i] = Math.round((x / width) * 255)
      raw[i + 1] = Math.round((y / height) * 255)
      raw[i + 2] = 90
    }
  }
  return sharp(raw, { raw: { width, height, channels: 3 } })
    .toFormat(format)
    .toBuffer()
}

/** Random pixels barely compress: a PNG of them is about width × height × 3 bytes. */
export function noisePng(width: number, height: number) {
  const raw = Buffer.alloc(width * height * 3)
  for (let i = 0; i < raw.length; i++) raw[i] = (i * 2654435761) >>> 24
  return sharp(raw, { raw: { width, height, channels: 3 } })
    .png({ compressionLevel: 0 })
    .toBuffer()
}
