import { randomBytes, timingSafeEqual } from 'node:crypto'
import { parseDeviceToken } from '@shared/ingest/contract'
import type { Models } from '../models'
import { hashSecret } from '../access/tokens'
import type { DeviceActor } from '../access/actor'

/** `twd_<id>_<secret>`: the id finds the row, the secret (32 random bytes) is stored only as a hash. */
export function newDeviceToken(deviceId: number) {
  const secret = randomBytes(32).toString('base64url')
  return { token: `twd_${deviceId}_${secret}`, hash: hashSecret(secret) }
}

/** The device a token belongs to, or null when it is unknown, wrong, revoked, or its tank archived. */
export async function deviceFromToken(models: Models, token: string, expectedId?: number): Promise<DeviceActor | null> {
  const parsed = parseDeviceToken(token)
  if (!parsed || (expectedId !== undefined && parsed.deviceId !== expectedId)) return null
  const device = await models.Device.findByPk(parsed.deviceId, { include: [{ association: 'tank', attributes: ['id', 'archivedAt'] }] })
  if (!device || device.revokedAt || device.tank?.archivedAt) return null
  const given = Buffer.from(hashSecret(parsed.secret), 'hex')
  const stored = Buffer.from(device.tokenHash, 'hex')
  if (given.length !== stored.length || !timingSafeEqual(given, stored)) return null
  return { kind: 'device', deviceId: device.id, organizationId: device.organizationId, tankId: device.tankId }
}
