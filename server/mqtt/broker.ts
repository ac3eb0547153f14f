import { createServer, type Server } from 'node:net'
import { Aedes, type Client } from 'aedes'
import {
  MAX_PAYLOAD_BYTES,
  commandsTopic,
  messageOutcome,
  messageRefused,
  outcomesTopic,
  parseDeviceTopic,
  readingsTopic,
  type MessageOutcome,
} from '@shared/ingest/contract'
import { deviceFromToken } from '../devices'
import type { DeviceActor } from '../access/actor'
import type { AppContext } from '../context'
import { MalformedMessageError } from '../readings'
import { GuardedSocket, type PacketLimits, type PacketRefusal } from './packet-guard'

// AuthErrorCode is a const enum, which isolatedModules cannot import: 4 = bad user name or password.
const BAD_USERNAME_OR_PASSWORD = 4
const SERVER_UNAVAILABLE = 3
const PUBLISH = 3

/** A connection that has not sent CONNECT by then is closed. */
export const CONNECT_TIMEOUT_MS = 5000
/**
 * Packets a device may send while its CONNECT is still being checked; past it the connection closes.
 * Each may be a whole message (PACKET_LIMITS.publishBytes), so this bounds what a connection can
 * make the broker hold before it is known (the broker's own default is 42).
 */
export const QUEUED_BEFORE_CONNECTED = 4
/** Checked on each packet's fixed header, before the packet is buffered. */
export const PACKET_LIMITS: PacketLimits = {
  // Client id, credentials (a token is under 150 bytes) and a will.
  connectBytes: 16 * 1024,
  // The topic and packet id around a message of at most MAX_PAYLOAD_BYTES.
  publishBytes: MAX_PAYLOAD_BYTES + 1024,
  otherBytes: 16 * 1024,
}
const TOO_LARGE = `the message is larger than ${MAX_PAYLOAD_BYTES} bytes; send fewer readings per message`

/** `cut`: revoked while connected; nothing more from it is taken in, its will included. */
type DeviceClient = Client & { device?: DeviceActor; cut?: boolean }

export type EmbeddedBroker = { port: number; broker: Aedes; close: () => Promise<void>; stats: () => BrokerStats }
export type BrokerStats = { connected: number; messages: number; malformed: number; refusedPackets: number }

/**
 * The in-process MQTT broker. A device connects with its id as user name and its token as
 * password, may publish only to its own readings topic and subscribe only to its own commands and
 * outcomes. Each QoS 1 reading message is acknowledged only after the ingest path has stored it,
 * and its outcome is published on the device's outcomes topic.
 */
export async function startEmbeddedBroker(ctx: AppContext, options: { host: string; port: number }): Promise<EmbeddedBroker> {
  const { models, logger, readings } = ctx
  const byDevice = new Map<number, Set<DeviceClient>>()
  const stats: BrokerStats = { connected: 0, messages: 0, malformed: 0, refusedPackets: 0 }

  /** Tells the device what became of a message; `then` runs once the outcome is on its way. */
  const tell = (device: DeviceActor, outcome: MessageOutcome, then?: () => void) =>
    broker.publish(
      { cmd: 'publish', topic: outcomesTopic(device.deviceId), payload: Buffer.from(JSON.stringify(outcome)), qos: 0, retain: false, dup: false },
      () => then?.(),
    )

  const broker = await Aedes.createBroker({
    drainTimeout: 10_000,
    connectTimeout: CONNECT_TIMEOUT_MS,
    queueLimit: QUEUED_BEFORE_CONNECTED,
    authenticate: (client: DeviceClient, username, password, done) => {
      const id = Number(username)
      const token = password?.toString('utf8') ?? ''
      if (!Number.isInteger(id) || id <= 0 || !token) {
        return done(Object.assign(new Error('bad credentials'), { returnCode: BAD_USERNAME_OR_PASSWORD }), false)
      }
      deviceFromToken(models, token, id).then(
        (device) => {
          if (!device) return done(Object.assign(new Error('bad credentials'), { returnCode: BAD_USERNAME_OR_PASSWORD }), false)
          client.device = device
          // Client ids live in the device's own namespace: another device choosing the same id
          // cannot take this one's session over (MQTT lets a new connection replace an old one by id).
          client.id = `${device.deviceId}/${client.id}`
          done(null, true)
        },
        (error) => {
          logger.error({ err: error }, 'MQTT authentication failed')
          done(Object.assign(new Error('server unavailable'), { returnCode: SERVER_UNAVAILABLE }), false)
        },
      )
    },
    authorizeSubscribe: (client: DeviceClient, subscription, done) => {
      const id = client.device?.deviceId
      const allowed = id !== undefined && !client.cut && (subscription.topic === commandsTopic(id) || subscription.topic === outcomesTopic(id))
      done(null, allowed ? subscription : null)
    },
    authorizePublish: (client: DeviceClient | null, packet, done) => {
      if (!client) return done(null) // the broker's own messages
      if (client.cut) return done(new Error('the device was revoked'))
      const device = client.device
      const target = parseDeviceTopic(packet.topic)
      if (!device || !target || target.channel !== 'readings' || target.deviceId !== device.deviceId) {
        logger.warn({ deviceId: device?.deviceId, topic: packet.topic }, 'MQTT publish outside the device topic refused')
        return done(new Error(`publishing is allowed only to ${device ? readingsTopic(device.deviceId) : 'your own topic'}`))
      }
      stats.messages++
      const messageId = packet.qos > 0 ? (packet.messageId ?? null) : null
      if (packet.payload.length > MAX_PAYLOAD_BYTES) {
        // MQTT 3.1.1 cannot refuse one message: the connection closes once the device has been told why.
        readings.status.rejected(device.deviceId, 1, TOO_LARGE)
        return tell(device, messageRefused(messageId, TOO_LARGE, 'body'), () => done(new Error(TOO_LARGE)))
      }
      let body: unknown
      try {
        body = JSON.parse(packet.payload.toString('utf8'))
      } catch {
        stats.malformed++
        readings.status.rejected(device.deviceId, 1, 'payload is not valid JSON')
        tell(device, messageRefused(messageId, 'payload is not valid JSON', 'body'))
        return done(null) // acknowledged and counted: resending the same bytes would not help
      }
      readings.ingest.fromDevice(device, body, { hold: true }).then(
        (summary) => {
          tell(device, messageOutcome(messageId, summary))
          done(null)
        },
        (error) => {
          if (error instanceof MalformedMessageError) {
            stats.malformed++
            tell(device, messageRefused(messageId, error.message, error.field))
            return done(null)
          }
          // Buffer full or an unexpected failure: no acknowledgement, the connection drops and the device resends.
          logger.warn({ err: error, deviceId: device.deviceId }, 'MQTT readings refused')
          done(error as Error)
        },
      )
    },
  })

  broker.on('client', (client: DeviceClient) => {
    if (!client.device) return
    stats.connected++
    let set = byDevice.get(client.device.deviceId)
    if (!set) byDevice.set(client.device.deviceId, (set = new Set()))
    set.add(client)
  })
  broker.on('clientDisconnect', (client: DeviceClient) => {
    if (!client.device) return
    stats.connected--
    byDevice.get(client.device.deviceId)?.delete(client)
  })
  const onRevoked = ({ deviceId }: { deviceId: number }) => {
    for (const client of byDevice.get(deviceId) ?? []) {
      client.cut = true
      client.close()
    }
    byDevice.delete(deviceId)
  }
  ctx.events.on('device.revoked', onRevoked)

  /** A packet over its limit: before CONNECT the socket just closes; a device's oversize message is refused as above. */
  function onRefused(client: DeviceClient, socket: GuardedSocket, refusal: PacketRefusal) {
    stats.refusedPackets++
    const device = client.connected && !client.cut ? client.device : undefined
    logger.warn({ deviceId: device?.deviceId, address: socket.socket.remoteAddress, ...refusal }, 'MQTT packet refused')
    if (!device || refusal.packetType !== PUBLISH) return socket.cut()
    readings.status.rejected(device.deviceId, 1, TOO_LARGE)
    tell(device, messageRefused(null, TOO_LARGE, 'body'), () => client.close())
  }

  const server: Server = createServer((socket) => {
    // eslint-disable-next-line prefer-const -- the guard is built before the client it reports to: a refusal before broker.handle returns must read undefined, where const would throw
    let client: DeviceClient | undefined
    const guarded: GuardedSocket = new GuardedSocket(socket, PACKET_LIMITS, (refusal) => (client ? onRefused(client, guarded, refusal) : guarded.cut()))
    client = broker.handle(guarded) as DeviceClient
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(options.port, options.host, () => resolve())
  })
  const address = server.address()
  const port = typeof address === 'object' && address ? address.port : options.port
  logger.info({ port }, 'MQTT broker listening')

  return {
    port,
    broker,
    stats: () => ({ ...stats }),
    close: async () => {
      ctx.events.off('device.revoked', onRevoked)
      await new Promise<void>((resolve) => broker.close(() => resolve()))
      await new Promise<void>((resolve) => server.close(() => resolve()))
    },
  }
}
