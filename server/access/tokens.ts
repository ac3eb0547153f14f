import { randomUUID, createHash, createSecretKey, randomBytes, type KeyObject } from 'node:crypto'
import jwt from 'jsonwebtoken'

export type AccessClaims = { sub: string; org: number; jti: string; typ: 'user' }

/** HS256 only: a token with any other `alg` (including `none`) is refused on verification. */
const ALGORITHM = 'HS256' as const
const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export function signAccessToken(secret: string, claims: { userId: number; organizationId: number }, hours: number) {
  const jti = randomUUID()
  const expiresAt = new Date(Date.now() + hours * 3600_000)
  const token = jwt.sign({ org: claims.organizationId, typ: 'user' }, secret, {
    algorithm: ALGORITHM,
    subject: String(claims.userId),
    jwtid: jti,
    expiresIn: Math.round(hours * 3600),
  })
  return { token, jti, expiresAt }
}

/*
 * Given a string, jsonwebtoken first tries it as a public key, which throws, then makes a secret key
 * of it: on every request. The key is made once per secret instead.
 */
const secretKeys = new Map<string, KeyObject>()
function secretKey(secret: string): KeyObject {
  let key = secretKeys.get(secret)
  if (!key) secretKeys.set(secret, (key = createSecretKey(Buffer.from(secret))))
  return key
}

export function verifyAccessToken(secret: string, token: string): AccessClaims | null {
  try {
    const payload = jwt.verify(token, secretKey(secret), { algorithms: [ALGORITHM] })
    if (typeof payload !== 'object' || payload.typ !== 'user' || !payload.sub || !payload.jti) return null
    // The session id is a UUID; anything else would only reach the database to fail there.
    if (!UUID_RE.test(payload.jti) || !/^\d{1,10}$/.test(payload.sub) || !Number.isInteger(payload.org)) return null
    return payload as AccessClaims
  } catch {
    return null
  }
}

/** A random secret for links (invitations, later acknowledge links) and its stored hash. */
export function newSecretToken() {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashSecret(token) }
}

export function hashSecret(token: string) {
  return createHash('sha256').update(token).digest('hex')
}
