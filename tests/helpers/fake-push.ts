import { createECDH, createDecipheriv, createPublicKey, hkdfSync, randomBytes, verify, type ECDH } from 'node:crypto'
import { createServer, type IncomingMessage } from 'node:http'
import type { AddressInfo } from 'node:net'

/** A push the fake service accepted, decrypted with the subscription's own keys. */
export type ReceivedPush = {
  subscription: string
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- the decrypted JSON as sent; each test reads the fields it checks
  payload: any
  ttl: number
  urgency: string | null
  topic: string | null
  vapid: { sub: string; aud: string; exp: number; publicKey: string }
}

type Keys = { ecdh: ECDH; auth: Buffer }

const b64u = (b: Buffer) => b.toString('base64url')
const bytes = async (req: IncomingMessage) => {
  const chunks: Buffer[] = []
  for await (const c of req) chunks.push(c as Buffer)
  return Buffer.concat(chunks)
}

/**
 * RFC 8291 (Message Encryption for Web Push) over RFC 8188's aes128gcm: the header carries the salt,
 * record size and the sender's public key; one record, whose plaintext ends with the delimiter 0x02.
 */
export function decryptPush(body: Buffer, keys: Keys): string {
  const salt = body.subarray(0, 16)
  const idLength = body[20]
  const senderKey = body.subarray(21, 21 + idLength)
  const ciphertext = body.subarray(21 + idLength)
  const shared = keys.ecdh.computeSecret(senderKey)
  const keyInfo = Buffer.concat([Buffer.from('WebPush: info\0'), keys.ecdh.getPublicKey(), senderKey])
  const ikm = Buffer.from(hkdfSync('sha256', shared, keys.auth, keyInfo, 32))
  const cek = Buffer.from(hkdfSync('sha256', ikm, salt, Buffer.from('Content-Encoding: aes128gcm\0'), 16))
  const nonce = Buffer.from(hkdfSync('sha256', ikm, salt, Buffer.from('Content-Encoding: nonce\0'), 12))
  const decipher = createDecipheriv('aes-128-gcm', cek, nonce)
  decipher.setAuthTag(ciphertext.subarray(ciphertext.length - 16))
  const plain = Buffer.concat([decipher.update(ciphertext.subarray(0, ciphertext.length - 16)), decipher.final()])
  let end = plain.length - 1
  while (end >= 0 && plain[end] === 0) end--
  if (plain[end] !== 2) throw new Error('not the last record: delimiter 0x02 missing')
  return plain.subarray(0, end).toString('utf8')
}

/** RFC 8292: `vapid t=<ES256 JWT>, k=<the application server's public key>`; answers the claims or why not. */
export function verifyVapid(header: string | undefined, origin: string): ReceivedPush['vapid'] | string {
  const match = /^vapid t=([\w-]+\.[\w-]+\.[\w-]+), k=([\w-]+)$/.exec(header ?? '')
  if (!match) return 'Authorization is not "vapid t=…, k=…"'
  const [, jwt, k] = match
  const point = Buffer.from(k, 'base64url')
  if (point.length !== 65 || point[0] !== 4) return 'k is not an uncompressed P-256 point'
  const key = createPublicKey({ key: { kty: 'EC', crv: 'P-256', x: b64u(point.subarray(1, 33)), y: b64u(point.subarray(33)) }, format: 'jwk' })
  const [head, claims, signature] = jwt.split('.')
  if (JSON.parse(Buffer.from(head, 'base64url').toString()).alg !== 'ES256') return 'JWT alg is not ES256'
  if (!verify('sha256', Buffer.from(`${head}.${claims}`), { key, dsaEncoding: 'ieee-p1363' }, Buffer.from(signature, 'base64url'))) return 'bad JWT signature'
  const c = JSON.parse(Buffer.from(claims, 'base64url').toString()) as { aud: string; exp: number; sub: string }
  if (c.aud !== origin) return `aud ${c.aud} is not ${origin}`
  const now = Date.now() / 1000
  if (!(c.exp > now && c.exp <= now + 24 * 3600)) return 'exp not within 24 hours'
  if (!/^(mailto:|https:)/.test(c.sub)) return 'sub is not a mailto: or https: contact'
  return { sub: c.sub, aud: c.aud, exp: c.exp, publicKey: k }
}

/**
 * A push service on loopback that behaves like a real one (RFC 8030 §5): POST /push/<id> with an
 * aes128gcm body, a TTL and a VAPID Authorization; 201 when accepted. Subscriptions are made here
 * with the test's own ECDH key pair and auth secret, so it can decrypt what it receives.
 * `answer(status)` makes it refuse (503 down, 410 gone) until told otherwise.
 */
export async function startFakePushService() {
  const keys = new Map<string, Keys>()
  const received: ReceivedPush[] = []
  const refused: Array<{ subscription: string; status: number }> = []
  const answers = new Map<string, number>()
  let everyone: number | null = null

  const server = createServer(async (req, res) => {
    const body = await bytes(req)
    const id = /^\/push\/([\w-]+)$/.exec(req.url ?? '')?.[1]
    const reply = (status: number, text = '') => res.writeHead(status, { 'content-type': 'text/plain' }).end(text)
    if (req.method !== 'POST' || !id || !keys.has(id)) return reply(404, 'no such subscription')
    const status = answers.get(id) ?? everyone
    if (status) {
      refused.push({ subscription: id, status })
      return reply(status, status === 410 ? 'subscription expired' : 'unavailable')
    }
    const ttl = Number(req.headers.ttl)
    if (req.headers.ttl === undefined || !Number.isInteger(ttl) || ttl < 0) return reply(400, 'TTL header required')
    if (req.headers['content-encoding'] !== 'aes128gcm') return reply(415, 'aes128gcm only')
    const vapid = verifyVapid(req.headers.authorization, service.origin)
    if (typeof vapid === 'string') return reply(401, vapid)
    const payload = JSON.parse(decryptPush(body, keys.get(id)!))
    received.push({ subscription: id, payload, ttl, urgency: (req.headers.urgency as string) ?? null, topic: (req.headers.topic as string) ?? null, vapid })
    res.writeHead(201, { location: `${service.origin}/message/${received.length}` }).end()
  })
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const service = {
    origin: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    received,
    refused,
    /** A browser's subscription as `PushSubscription.toJSON()` gives it: endpoint and keys. */
    subscribe(label = 'Test phone') {
      const id = randomBytes(9).toString('base64url')
      const ecdh = createECDH('prime256v1')
      ecdh.generateKeys()
      const auth = randomBytes(16)
      keys.set(id, { ecdh, auth })
      return { id, body: { endpoint: `${service.origin}/push/${id}`, keys: { p256dh: b64u(ecdh.getPublicKey()), auth: b64u(auth) }, label } }
    },
    /** Answer this status to one subscription (or to all when `id` is omitted); null: accept again. */
    answer(status: number | null, id?: string) {
      if (id === undefined) everyone = status
      else if (status === null) answers.delete(id)
      else answers.set(id, status)
    },
    for: (id: string) => received.filter((r) => r.subscription === id),
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
  return service
}
