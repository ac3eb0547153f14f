import type { IncomingMessage, Server } from 'node:http'
import type { Duplex } from 'node:stream'
import { Op, QueryTypes } from 'sequelize'
import { WebSocketServer, type WebSocket } from 'ws'
import { LIVE_CLOSE, liveClientMessageSchema, type LiveReading, type LiveServerMessage } from '@shared/schemas/live'
import type { Actor } from '../access/actor'
import { userActorFromToken, userActorOfSession } from '../access/passport'
import { wallFromToken, wallStillValid } from '../sites'
import type { AppContext } from '../context'
import type { StoredReading } from '../platform/events'
import { canSeeSite, siteFilter, tankScope } from '../access/scope'
import { catchUpPages } from './catch-up'

const AUTH_TIMEOUT_MS = 5000
/** A socket whose unsent frames pass this is dropped: its client is not reading. */
export const MAX_BACKLOG_BYTES = 1024 * 1024
/** A catch-up sends its next page only once the backlog is below this. */
const PAGE_BACKLOG_BYTES = 256 * 1024

type Peer = { socket: WebSocket; actor?: Actor; tanks: Set<number>; buffer: LiveReading[]; work: Promise<void> }

export type LiveHubOptions = { coalesceMs?: number; revocationCheckMs?: number }

/**
 * The live hub: a `ws` server on the HTTP server's `/ws` upgrade. Each socket authenticates
 * with its first frame, subscribes to tanks or a site it may see, and receives new readings
 * coalesced to at most twenty frames a second.
 */
export function attachLiveHub(ctx: AppContext, server: Server, options: LiveHubOptions = {}) {
  const wss = new WebSocketServer({ noServer: true, maxPayload: 64 * 1024 })
  const peers = new Set<Peer>()
  // 50 ms: at most twenty frames a second per screen, and a reading reaches it within ~100 ms of arrival.
  const coalesceMs = options.coalesceMs ?? 50

  const send = (peer: Peer, message: LiveServerMessage) => {
    if (peer.socket.readyState !== peer.socket.OPEN) return
    peer.socket.send(JSON.stringify(message))
    if (peer.socket.bufferedAmount > MAX_BACKLOG_BYTES) {
      // Closing politely would queue the close frame behind the backlog; the memory goes now.
      ctx.logger.warn({ backlog: peer.socket.bufferedAmount }, 'live socket dropped: its client is not reading')
      peer.socket.terminate()
    }
  }

  /** Resolves once the socket has taken most of what was sent (true), or has closed (false). */
  async function drained(peer: Peer) {
    while (peer.socket.readyState === peer.socket.OPEN && peer.socket.bufferedAmount > PAGE_BACKLOG_BYTES) {
      await new Promise((r) => setTimeout(r, 25))
    }
    return peer.socket.readyState === peer.socket.OPEN
  }

  async function visibleTanks(actor: Actor, tankIds?: number[], siteId?: number) {
    const where: Record<string | symbol, unknown> = { ...(tankScope(actor) as object), archivedAt: null }
    if (tankIds) where.id = { [Op.in]: tankIds }
    // Keep the actor's own site limit: a site filter must narrow it, never replace it.
    if (siteId) where.siteId = siteFilter(actor, siteId)
    const rows = await ctx.models.Tank.findAll({ where, attributes: ['id'] })
    return rows.map((t) => t.id)
  }

  async function catchUp(peer: Peer, tankIds: number[], since: string) {
    const pages = await catchUpPages(ctx.sequelize, tankIds, since)
    if (!pages.length) return send(peer, { type: 'readings', catchUp: true, readings: [] })
    for (const readings of pages) {
      if (!(await drained(peer))) return
      send(peer, { type: 'readings', catchUp: true, readings })
    }
  }

  async function onMessage(peer: Peer, data: string) {
    let json: unknown
    try {
      json = JSON.parse(data)
    } catch {
      return send(peer, { type: 'error', code: 'invalid_json', message: 'Frames must be JSON' })
    }
    const parsed = liveClientMessageSchema.safeParse(json)
    if (!parsed.success) {
      return send(peer, { type: 'error', code: 'invalid_message', message: parsed.error.issues[0].message })
    }
    const message = parsed.data
    if (message.type === 'auth') {
      const actor: Actor | null =
        (await userActorFromToken(ctx.models, ctx.config.jwtSecret, message.token)) ?? (await wallFromToken(ctx.models, message.token))
      if (!actor) return peer.socket.close(LIVE_CLOSE.unauthenticated, 'token missing, expired or revoked')
      peer.actor = actor
      return send(peer, { type: 'ready', role: actor.role })
    }
    if (!peer.actor) return peer.socket.close(LIVE_CLOSE.unauthenticated, 'authenticate first')
    if (message.type === 'ping') return send(peer, { type: 'pong' })
    if (message.type === 'unsubscribe') {
      for (const id of message.tankIds) peer.tanks.delete(id)
      return send(peer, { type: 'subscribed', tankIds: [...peer.tanks] })
    }
    const allowed = await visibleTanks(peer.actor, message.tankIds, message.siteId)
    const asked = message.tankIds ?? []
    if (asked.some((id) => !allowed.includes(id)) || (message.siteId && !allowed.length && !(await siteVisible(peer.actor, message.siteId)))) {
      return send(peer, { type: 'error', code: 'forbidden', message: 'You may not watch one or more of these tanks' })
    }
    // Tanks already watched are not caught up again: a repeated subscribe costs one query and no readings.
    const added = allowed.filter((id) => !peer.tanks.has(id))
    for (const id of added) peer.tanks.add(id)
    send(peer, { type: 'subscribed', tankIds: [...peer.tanks].sort((a, b) => a - b) })
    if (message.since && added.length) await catchUp(peer, added, message.since)
  }

  async function siteVisible(actor: Actor, siteId: number) {
    return canSeeSite(actor, await ctx.models.Site.findByPk(siteId))
  }

  const onStored = (rows: StoredReading[]) => {
    for (const peer of peers) {
      if (!peer.tanks.size) continue
      for (const r of rows) {
        if (peer.tanks.has(r.tankId)) {
          peer.buffer.push({ tankId: r.tankId, metric: r.metric, time: r.time.toISOString(), value: r.value, source: r.source })
        }
      }
    }
  }
  ctx.events.on('readings.stored', onStored)

  // Incident changes go out at once (they are rare); a revoked wall display is cut off.
  const onIncident = (change: { incidentId: number; tankId: number; siteId: number; state: string }) => {
    for (const peer of peers) if (peer.tanks.has(change.tankId)) send(peer, { type: 'incident', ...change })
  }
  const onWallRevoked = ({ credentialId }: { credentialId: number }) => {
    for (const peer of peers) {
      if (peer.actor?.kind === 'wall' && peer.actor.credentialId === credentialId) peer.socket.close(LIVE_CLOSE.unauthenticated, 'revoked')
    }
  }
  ctx.events.on('incident.changed', onIncident)
  ctx.events.on('wall.revoked', onWallRevoked)

  /**
   * Someone's sites, role or status changed, or a site or tank was archived: each open socket of
   * that organization is held to its scope as it is now. A person or display that lost everything
   * is closed; a socket that lost some tanks stops receiving them and is told its new list.
   */
  async function recheckScope(peer: Peer) {
    const actor = peer.actor
    if (!actor) return
    const current: Actor | null =
      actor.kind === 'user'
        ? await userActorOfSession(ctx.models, actor.sessionId, actor.userId, actor.organizationId)
        : (await wallStillValid(ctx.models, actor.credentialId))
          ? actor
          : null
    if (!current) return peer.socket.close(LIVE_CLOSE.unauthenticated, 'access withdrawn')
    peer.actor = current
    if (!peer.tanks.size) return
    const still = new Set(await visibleTanks(current, [...peer.tanks]))
    if (still.size === peer.tanks.size) return
    peer.tanks = still
    peer.buffer = peer.buffer.filter((r) => still.has(r.tankId))
    send(peer, { type: 'subscribed', tankIds: [...still].sort((a, b) => a - b) })
  }
  const onAccessChanged = ({ organizationId }: { organizationId: number }) => {
    for (const peer of peers) {
      if (peer.actor?.organizationId !== organizationId) continue
      // In line with the socket's own frames, so a subscribe being handled cannot add back what this takes away.
      peer.work = peer.work.then(() => recheckScope(peer)).catch((error) => ctx.logger.warn({ err: error }, 'live scope check failed'))
    }
  }
  ctx.events.on('access.changed', onAccessChanged)

  // Sign-out, a password change or reset, a deactivated user and another instance's wall revocation
  // raise no event here: every few seconds, sockets whose session or wall key is no longer valid are closed.
  async function closeRevoked() {
    const sessionIds = [...peers].flatMap((p) => (p.actor?.kind === 'user' ? [p.actor.sessionId] : []))
    const wallIds = [...peers].flatMap((p) => (p.actor?.kind === 'wall' ? [p.actor.credentialId] : []))
    if (!sessionIds.length && !wallIds.length) return
    const dead = await ctx.sequelize.query<{ key: string }>(
      `SELECT 's' || id::text AS key FROM sessions WHERE id = ANY($sessions::uuid[]) AND (revoked_at IS NOT NULL OR expires_at <= now())
       UNION ALL SELECT 'w' || id::text FROM wall_credentials WHERE id = ANY($walls::int[]) AND revoked_at IS NOT NULL`,
      { bind: { sessions: sessionIds, walls: wallIds }, type: QueryTypes.SELECT },
    )
    const keys = new Set(dead.map((r) => r.key))
    for (const peer of peers) {
      const key = peer.actor?.kind === 'user' ? `s${peer.actor.sessionId}` : peer.actor?.kind === 'wall' ? `w${peer.actor.credentialId}` : ''
      if (keys.has(key)) peer.socket.close(LIVE_CLOSE.unauthenticated, 'revoked')
    }
  }
  const revocationTimer = setInterval(() => {
    closeRevoked().catch((error) => ctx.logger.warn({ err: error }, 'live revocation check failed'))
  }, options.revocationCheckMs ?? 3000)
  revocationTimer.unref()

  const flushTimer = setInterval(() => {
    for (const peer of peers) {
      if (!peer.buffer.length) continue
      const readings = peer.buffer
      peer.buffer = []
      send(peer, { type: 'readings', readings })
    }
  }, coalesceMs)
  flushTimer.unref()

  wss.on('connection', (socket: WebSocket) => {
    const peer: Peer = { socket, tanks: new Set(), buffer: [], work: Promise.resolve() }
    peers.add(peer)
    const authTimer = setTimeout(() => {
      if (!peer.actor) socket.close(LIVE_CLOSE.unauthenticated, 'authenticate first')
    }, AUTH_TIMEOUT_MS)
    // Frames are handled one after another: a subscribe sent right behind its auth waits for it.
    socket.on('message', (data) => {
      const text = data.toString()
      peer.work = peer.work.then(() =>
        onMessage(peer, text).catch((error) => {
          ctx.logger.error({ err: error }, 'live message failed')
          send(peer, { type: 'error', code: 'internal', message: 'That did not work; try again' })
        }),
      )
    })
    socket.on('close', () => {
      clearTimeout(authTimer)
      peers.delete(peer)
    })
    socket.on('error', () => socket.terminate())
  })

  const onUpgrade = (req: IncomingMessage, socket: Duplex, head: Buffer) => {
    const path = (req.url ?? '').split('?')[0]
    if (path !== '/ws') return socket.destroy()
    wss.handleUpgrade(req, socket, head, (ws) => wss.emit('connection', ws, req))
  }
  server.on('upgrade', onUpgrade)

  return {
    peerCount: () => peers.size,
    close() {
      clearInterval(flushTimer)
      clearInterval(revocationTimer)
      ctx.events.off('readings.stored', onStored)
      ctx.events.off('incident.changed', onIncident)
      ctx.events.off('wall.revoked', onWallRevoked)
      ctx.events.off('access.changed', onAccessChanged)
      server.off('upgrade', onUpgrade)
      for (const peer of peers) peer.socket.close(1001, 'server stopping')
      wss.close()
    },
  }
}
