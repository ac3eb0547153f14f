import mqtt, { type MqttClient } from 'mqtt'
import { TOPIC_PREFIX, parseDeviceTopic } from '@shared/ingest/contract'
import type { DeviceActor } from '../access/actor'
import type { AppContext } from '../context'
import { MalformedMessageError } from '../readings'

/** Instances of one deployment share the subscription, so each message is taken by one of them. */
export const SHARED_GROUP = 'tankwarden'
export const SHARED_READINGS_FILTER = `$share/${SHARED_GROUP}/${TOPIC_PREFIX}/+/readings`

export type ExternalConsumerOptions = {
  /**
   * Connections per instance. MQTT.js handles a connection's messages one after another and the
   * acknowledgement waits for the commit, so one connection stores about one message per flush;
   * several connections (all in the shared group) let the writer batch them together.
   */
  connections?: number
  /** How long the broker keeps this instance's session (and the messages routed to it) while it is away. */
  sessionExpirySeconds?: number
  /** How long a graceful stop waits for messages still arriving on the session before it disconnects. */
  quietMs?: number
}

export type ExternalConsumer = { clientIds: string[]; close: () => Promise<void> }

/** Raised for a message that could not be stored: its PUBACK is withheld and the session resumed. */
class NotStoredError extends Error {}

/**
 * With MQTT_URL set the app runs no broker of its own: it subscribes to the shop's broker, which
 * authenticates devices and enforces the topic ACL (see README). A message is acknowledged to the
 * broker only after it has been stored, so a crash before that makes the broker deliver it again.
 *
 * MQTT 5 is required: MQTT.js honours `customHandleAcks` only with protocol version 5. Sessions
 * are persistent under client ids derived from INSTANCE_ID, because mosquitto (2.0) drops the
 * unacknowledged messages of a shared subscriber whose clean session ends instead of handing them
 * to another group member; a persistent session keeps them for the instance's return.
 */
export async function startExternalConsumer(ctx: AppContext, url: string, options: ExternalConsumerOptions = {}): Promise<ExternalConsumer> {
  const { models, logger, readings, config } = ctx
  const connections = options.connections ?? 4
  const sessionExpiry = options.sessionExpirySeconds ?? 24 * 3600
  const quietMs = options.quietMs ?? 300
  const deviceCache = new Map<number, { device: DeviceActor | null; at: number }>()
  let active = 0
  let lastMessageAt = 0

  async function lookup(deviceId: number): Promise<DeviceActor | null> {
    const cached = deviceCache.get(deviceId)
    if (cached && Date.now() - cached.at < 60_000) return cached.device
    const row = await models.Device.findByPk(deviceId, { include: [{ association: 'tank', attributes: ['id', 'archivedAt'] }] })
    const device =
      row && !row.revokedAt && !row.tank?.archivedAt
        ? { kind: 'device' as const, deviceId: row.id, organizationId: row.organizationId, tankId: row.tankId }
        : null
    deviceCache.set(deviceId, { device, at: Date.now() })
    return device
  }
  const onRevoked = ({ deviceId }: { deviceId: number }) => void deviceCache.delete(deviceId)
  ctx.events.on('device.revoked', onRevoked)

  /** Stores one message; resolves when it may be acknowledged, throws NotStoredError when it may not. */
  async function handle(topic: string, message: Buffer): Promise<void> {
    const target = parseDeviceTopic(topic)
    if (!target || target.channel !== 'readings') return
    let device: DeviceActor | null
    try {
      device = await lookup(target.deviceId)
    } catch (error) {
      throw new NotStoredError(`device lookup failed: ${(error as Error).message}`)
    }
    if (!device) {
      logger.warn({ deviceId: target.deviceId }, 'external MQTT message from an unknown or revoked device dropped')
      return
    }
    let body: unknown
    try {
      body = JSON.parse(message.toString('utf8'))
    } catch {
      readings.status.rejected(device.deviceId, 1, 'payload is not valid JSON')
      return
    }
    try {
      await readings.ingest.fromDevice(device, body, { hold: true })
    } catch (error) {
      // A malformed envelope is already counted on the device; acknowledging it ends its redelivery.
      if (error instanceof MalformedMessageError) return
      throw new NotStoredError((error as Error).message)
    }
  }

  function connect(clientId: string): Promise<MqttClient> {
    const client = mqtt.connect(url, {
      clientId,
      protocolVersion: 5,
      clean: false,
      properties: { sessionExpiryInterval: sessionExpiry },
      reconnectPeriod: 2000,
      customHandleAcks: (topic, message, _packet, done) => {
        active++
        lastMessageAt = Date.now()
        handle(topic, message)
          .then(
            () => done(0),
            (error: Error) => done(error),
          )
          .finally(() => {
            active--
            lastMessageAt = Date.now()
          })
      },
    })
    client.on('error', (error) => {
      if (error instanceof NotStoredError) {
        // No PUBACK went out; dropping the connection makes the broker resend it when the session resumes.
        logger.warn({ clientId, err: error }, 'external MQTT message not stored; reconnecting for redelivery')
        client.stream.destroy()
        return
      }
      logger.warn({ clientId, err: error }, 'external MQTT connection error')
    })
    return new Promise((resolve, reject) => {
      client.once('connect', () => resolve(client))
      client.once('error', (error) => {
        if (!client.connected) {
          client.end(true)
          reject(error)
        }
      })
    })
  }

  const clientIds = Array.from({ length: connections }, (_, i) => `tankwarden-${config.instanceId}-${i}`)
  const clients: MqttClient[] = []
  try {
    for (const id of clientIds) clients.push(await connect(id))
    // Subscribing again on a resumed session is harmless; it is how a fresh session joins the group.
    await Promise.all(clients.map((c) => c.subscribeAsync(SHARED_READINGS_FILTER, { qos: 1 })))
  } catch (error) {
    await Promise.all(clients.map((c) => c.endAsync(true)))
    ctx.events.off('device.revoked', onRevoked)
    throw error
  }
  logger.info({ url: url.replace(/\/\/[^@]*@/, '//***@'), clientIds }, 'subscribed to the external MQTT broker')

  return {
    clientIds,
    async close() {
      ctx.events.off('device.revoked', onRevoked)
      // Leave the group first so nothing new is routed here, then let what is on its way arrive and be stored.
      await Promise.all(clients.map((c) => (c.connected ? c.unsubscribeAsync(SHARED_READINGS_FILTER).catch(() => undefined) : undefined)))
      const until = Date.now() + 5000
      while (Date.now() < until && (active > 0 || Date.now() - lastMessageAt < quietMs)) await new Promise((r) => setTimeout(r, 50))
      await Promise.all(clients.map((c) => c.endAsync()))
    },
  }
}
