import { createServer, type Server } from 'node:net'
import { Aedes, type Client } from 'aedes'
import { commandsTopic, parseDeviceTopic, readingsTopic } from '@shared/ingest/contract'
import { deviceFromToken, type DeviceActor } from '../auth/device-tokens'
import type { AppContext } from '../context'
import { MalformedMessageError } from '../ingest/ingest-service'

// AuthErrorCode is a const enum, which isolatedModules cannot import: 4 = bad user name or password.
const BAD_USERNAME_OR_PASSWORD = 4
const SERVER_UNAVAILABLE = 3

type DeviceClient = Client & { device?: DeviceActor }

export type EmbeddedBroker = { port: number; broker: Aedes; close: () => Promise<void>; stats: () => BrokerStats }
export type BrokerStats = { connected: number; messages: number; malformed: number }

/**
 * The in-process MQTT broker. A device connects with its id as user name and its token as
 * password, may publish only to its own readings topic and subscribe only to its own commands.
 * Each QoS 1 reading message is acknowledged only after the ingest path has stored it.
 */
export async function startEmbeddedBroker(ctx: AppContext, options: { host: string; port: number }): Promise<EmbeddedBroker> {
  const { models, logger, readings } = ctx
  const byDevice = new Map<number, Set<DeviceClient>>()
  const stats: BrokerStats = { connected: 0, messages: 0, malformed: 0 }

  const broker = await Aedes.createBroker({
    drainTimeout: 10_000,
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
          done(null, true)
        },
        (error) => {
          logger.error({ err: error }, 'MQTT authentication failed')
          done(Object.assign(new Error('server unavailable'), { returnCode: SERVER_UNAVAILABLE }), false)
        },
      )
    },
    authorizeSubscribe: (client: DeviceClient, subscription, done) => {
      const allowed = client.device && subscription.topic === commandsTopic(client.device.deviceId)
      done(null, allowed ? subscription : null)
    },
    authorizePublish: (client: DeviceClient | null, packet, done) => {
      if (!client) return done(null) // the broker's own messages
      const device = client.device
      const target = parseDeviceTopic(packet.topic)
      if (!device || !target || target.channel !== 'readings' || target.deviceId !== device.deviceId) {
        logger.warn({ deviceId: device?.deviceId, topic: packet.topic }, 'MQTT publish outside the device topic refused')
        return done(new Error(`publishing is allowed only to ${device ? readingsTopic(device.deviceId) : 'your own topic'}`))
      }
      stats.messages++
      let body: unknown
      try {
        body = JSON.parse(packet.payload.toString('utf8'))
      } catch {
        stats.malformed++
        readings.status.rejected(device.deviceId, 1, 'payload is not valid JSON')
        return done(null) // acknowledged and counted: resending the same bytes would not help
      }
      readings.ingest.fromDevice(device, body, { hold: true }).then(
        () => done(null),
        (error) => {
          if (error instanceof MalformedMessageError) {
            stats.malformed++
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
    for (const client of byDevice.get(deviceId) ?? []) client.close()
    byDevice.delete(deviceId)
  }
  ctx.events.on('device.revoked', onRevoked)

  const server: Server = createServer(broker.handle)
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
