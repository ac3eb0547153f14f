import { randomBytes } from 'node:crypto'
import pg from 'pg'
import type { Sequelize } from 'sequelize'
import type { EventBus, EventMap } from '../events'
import type { Logger } from '../logger'
import { RELAYED_EVENTS, decodeEvent, encodeEvent, type RelayedEvent } from './codec'

export const FANOUT_CHANNEL = 'tankwarden_events'
/**
 * Notifications waiting for their statement, by count and bytes (a payload is under 8 KB): enough for
 * about a hundred thousand readings. Past it a slow database would only make them pile up in memory,
 * so newer ones are dropped with a warning; other instances' screens catch up from the table.
 */
export const MAX_QUEUED_PAYLOADS = 2000
export const MAX_QUEUED_BYTES = 8 * 1024 * 1024
/** Payloads sent in one statement. */
const PAYLOADS_PER_STATEMENT = 250

/** The part of the app's context the fan-out uses (platform code names no feature's types). */
export type FanoutContext = {
  config: { instanceId: string; clusterFanout: boolean; databaseUrl: string }
  events: EventBus
  logger: Logger
  sequelize: Sequelize
}

export type ClusterFanout = {
  origin: string
  /** Notifications from other instances re-emitted here so far (tests, diagnostics). */
  received: () => number
  /** True while an event from another instance is being emitted here, so a listener can tell it from a local one. */
  isRelaying: () => boolean
  stop: () => Promise<void>
}

/**
 * Spreads the in-process events of one instance to every instance on the same database with
 * PostgreSQL LISTEN/NOTIFY: what happens here is sent with one `pg_notify` statement per event
 * (a stored batch of readings is one statement, however many payloads it needs), and what other
 * instances send is emitted on this instance's bus, so the live hub pushes readings stored
 * elsewhere and the rule engine leader sees them. A single instance works the same, hearing only
 * itself (its own notifications are ignored).
 */
export async function startClusterFanout(ctx: FanoutContext, options: { reconnectMs?: number } = {}): Promise<ClusterFanout> {
  const { events, logger, sequelize } = ctx
  const origin = `${ctx.config.instanceId}:${randomBytes(4).toString('hex')}`
  const reconnectMs = options.reconnectMs ?? 1000
  // CLUSTER_FANOUT=false, for one instance alone on its database: nothing to tell, nobody to hear.
  if (!ctx.config.clusterFanout) return { origin, received: () => 0, isRelaying: () => false, stop: async () => undefined }
  // Every payload starts with its origin, so this instance's own are dropped without parsing them.
  const ownPrefix = `{"o":${JSON.stringify(origin)},`
  let relaying = false
  let stopped = false
  let received = 0
  let client: pg.Client | null = null
  let retry: NodeJS.Timeout | undefined
  const queue: string[] = []
  let queuedBytes = 0
  let sending: Promise<void> | null = null

  // Sent in order, one statement at a time (whatever queued meanwhile goes together), without holding up whoever emitted the event.
  function publish(payloads: string[]) {
    let dropped = 0
    for (const payload of payloads) {
      const bytes = Buffer.byteLength(payload, 'utf8')
      if (queue.length >= MAX_QUEUED_PAYLOADS || queuedBytes + bytes > MAX_QUEUED_BYTES) {
        dropped++
        continue
      }
      queue.push(payload)
      queuedBytes += bytes
    }
    if (dropped) logger.warn({ dropped, queued: queue.length, queuedBytes }, 'live fan-out queue full; notifications dropped')
    sending ??= send()
  }

  async function send() {
    while (queue.length) {
      const payloads = queue.splice(0, PAYLOADS_PER_STATEMENT)
      for (const payload of payloads) queuedBytes -= Buffer.byteLength(payload, 'utf8')
      await sequelize
        .query('SELECT pg_notify($1, payload) FROM unnest($2::text[]) WITH ORDINALITY AS p(payload, n) ORDER BY n', { bind: [FANOUT_CHANNEL, payloads] })
        .catch((error) => logger.warn({ err: error, payloads: payloads.length }, 'live fan-out to other instances failed'))
    }
    sending = null
  }

  const forwarders = RELAYED_EVENTS.map((event) => {
    const listener = (...args: unknown[]) => {
      if (relaying || stopped) return
      publish(encodeEvent(origin, event, args as EventMap[RelayedEvent]))
    }
    events.on(event, listener as never)
    return { event, listener }
  })

  function onNotification(message: pg.Notification) {
    if (message.channel !== FANOUT_CHANNEL || !message.payload || message.payload.startsWith(ownPrefix)) return
    const decoded = decodeEvent(message.payload)
    if (!decoded) return
    received++
    relaying = true
    try {
      ;(events.emit as (event: RelayedEvent, ...args: unknown[]) => void)(decoded.event, ...decoded.args)
    } catch (error) {
      logger.error({ err: error, event: decoded.event }, 'relayed event listener failed')
    } finally {
      relaying = false
    }
  }

  async function listen() {
    const next = new pg.Client({ connectionString: ctx.config.databaseUrl, keepAlive: true })
    next.on('notification', onNotification)
    next.on('error', (error) => logger.warn({ err: error }, 'live fan-out connection error'))
    next.on('end', () => {
      if (client !== next) return
      client = null
      if (stopped) return
      // Notifications sent while this connection is down are not replayed; ws clients catch up from the table on reconnect.
      logger.warn('live fan-out connection lost; listening again shortly')
      scheduleListen()
    })
    await next.connect()
    await next.query(`LISTEN ${FANOUT_CHANNEL}`)
    client = next
  }

  function scheduleListen() {
    retry = setTimeout(() => {
      listen().catch((error) => {
        logger.warn({ err: error }, 'live fan-out could not listen; retrying')
        if (!stopped) scheduleListen()
      })
    }, reconnectMs)
    retry.unref()
  }

  await listen()

  return {
    origin,
    received: () => received,
    isRelaying: () => relaying,
    async stop() {
      stopped = true
      clearTimeout(retry)
      for (const { event, listener } of forwarders) events.off(event, listener as never)
      await sending
      const c = client
      client = null
      await c?.end().catch(() => undefined)
    },
  }
}
