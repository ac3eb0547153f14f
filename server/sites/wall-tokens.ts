import { randomBytes, timingSafeEqual } from 'node:crypto'
import type { Models } from '../models'
import type { WallActor } from '../access/actor'
import { hashSecret } from '../access/tokens'

const WALL_TOKEN_RE = /^tww_(\d{1,10})_([A-Za-z0-9_-]{20,100})$/

/** `tww_<credential id>_<secret>`: the id finds the row, the secret is stored only as a hash. */
export function newWallToken(credentialId: number) {
  const secret = randomBytes(32).toString('base64url')
  return { token: `tww_${credentialId}_${secret}`, hash: hashSecret(secret) }
}

/** The wall display a key belongs to, or null when unknown, wrong, revoked or its site archived. */
export async function wallFromToken(models: Models, token: string): Promise<WallActor | null> {
  const match = WALL_TOKEN_RE.exec(token)
  if (!match) return null
  const credential = await models.WallCredential.findByPk(Number(match[1]))
  if (!credential || credential.revokedAt) return null
  const given = Buffer.from(hashSecret(match[2]), 'hex')
  const stored = Buffer.from(credential.tokenHash, 'hex')
  if (given.length !== stored.length || !timingSafeEqual(given, stored)) return null
  if (!(await siteOpen(models, credential.siteId))) return null
  // Last use is for the owner's list; an hour's precision is plenty and spares a write per request.
  if (!credential.lastUsedAt || Date.now() - credential.lastUsedAt.getTime() > 3600_000) {
    await credential.update({ lastUsedAt: new Date() })
  }
  return { kind: 'wall', credentialId: credential.id, organizationId: credential.organizationId, siteIds: [credential.siteId], role: 'wall' }
}

/** Whether a signed-in wall display still holds: false once its key is revoked or its site archived. */
export async function wallStillValid(models: Models, credentialId: number): Promise<boolean> {
  const credential = await models.WallCredential.findByPk(credentialId)
  return !!credential && !credential.revokedAt && (await siteOpen(models, credential.siteId))
}

async function siteOpen(models: Models, siteId: number) {
  const site = await models.Site.findByPk(siteId)
  return !!site && !site.archivedAt
}
