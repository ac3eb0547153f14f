import { existsSync, linkSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import webPush from 'web-push'
import type { Config } from '../config'
import { perContext } from '../platform/per-context'

export type VapidKeys = { subject: string; publicKey: string; privateKey: string }

const FILE = 'vapid-keys.json'

/**
 * The application server's key pair (RFC 8292): from the configuration when set, else made on the
 * first start and kept in the data folder, so subscriptions made against it outlive restarts.
 * The file is written whole beside its place and linked in, so two instances starting at once
 * agree on one pair: the second link fails and that instance reads the first one's file.
 */
export const vapidKeysFor = perContext((ctx: { config: Config }): VapidKeys => {
  const { push, dataDir } = ctx.config
  if (push.publicKey && push.privateKey) return { subject: push.subject, publicKey: push.publicKey, privateKey: push.privateKey }
  const file = join(dataDir, FILE)
  if (!existsSync(file)) {
    mkdirSync(dataDir, { recursive: true })
    const temporary = join(dataDir, `${FILE}.${process.pid}.${Date.now()}`)
    writeFileSync(temporary, JSON.stringify(webPush.generateVAPIDKeys()), { mode: 0o600 })
    try {
      linkSync(temporary, file)
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error
    } finally {
      rmSync(temporary, { force: true })
    }
  }
  const kept = JSON.parse(readFileSync(file, 'utf8')) as { publicKey: string; privateKey: string }
  return { subject: push.subject, publicKey: kept.publicKey, privateKey: kept.privateKey }
})
