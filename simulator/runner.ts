// The tick loop: advance every tank's physics, then send one batch per node.
import type { DeviceReading } from '@shared/ingest/contract'
import { FaultyOutbox, type OutgoingMessage } from './model/faults'
import type { TankSimulation } from './model/tank'
import type { SendOutcome, Transport } from './transport/types'

/** HTTP batches kept for a later tick while the app is down (503 or unreachable). */
export const MAX_RETRY_BATCHES = 50

export interface SimulatedNode {
  tankName: string
  deviceId: number
  sim: TankSimulation
  transport: Transport
  outbox: FaultyOutbox | null
  retryQueue: unknown[][]
}

export interface TickSummary {
  tick: number
  simTime: string
  nodes: number
  quiet: number
  messages: number
  readings: number
  delivered: number
  queued: number
  failed: number
  accepted: number
  duplicates: number
  rejected: number
  errors: string[]
}

/** What one node puts on the wire this tick (nothing while quiet). */
export function outgoingFor(node: SimulatedNode, time: string): OutgoingMessage[] {
  if (node.sim.isQuiet()) return []
  const good: DeviceReading[] = node.sim.readings(time)
  const fresh = node.outbox ? node.outbox.next(good) : [{ kind: 'readings' as const, readings: good }]
  const retries = node.retryQueue.splice(0).map((readings) => ({ kind: 'readings' as const, readings }))
  return [...retries, ...fresh]
}

const retryable = (outcome: SendOutcome) => !outcome.delivered && !outcome.queued && (outcome.status === undefined || outcome.status === 503)

function tally(summary: TickSummary, node: SimulatedNode, message: OutgoingMessage, outcome: SendOutcome): void {
  summary.messages += 1
  if (message.kind === 'readings') summary.readings += message.readings.length
  if (outcome.delivered) summary.delivered += 1
  else if (outcome.queued) summary.queued += 1
  else {
    summary.failed += 1
    summary.errors.push(`${node.tankName}: ${outcome.status ?? ''} ${outcome.error ?? ''}`.trim())
    if (message.kind === 'readings' && retryable(outcome) && node.retryQueue.length < MAX_RETRY_BATCHES) {
      node.retryQueue.push(message.readings)
    }
  }
  if (outcome.summary) {
    summary.accepted += outcome.summary.accepted
    summary.duplicates += outcome.summary.duplicates
    summary.rejected += outcome.summary.rejected
  }
}

async function sendAll(node: SimulatedNode, messages: OutgoingMessage[], summary: TickSummary): Promise<void> {
  for (const message of messages) {
    const outcome = message.kind === 'raw' ? await node.transport.sendRaw(message.body) : await node.transport.send(message.readings)
    tally(summary, node, message, outcome)
  }
}

export async function runTick(nodes: SimulatedNode[], tick: number, simDtS: number, now: Date): Promise<TickSummary> {
  for (const node of nodes) node.sim.advance(simDtS)
  const time = now.toISOString()
  const summary: TickSummary = {
    tick,
    simTime: new Date(nodes[0]?.sim.snapshot().simMs ?? now.getTime()).toISOString(),
    nodes: nodes.length,
    quiet: 0,
    messages: 0,
    readings: 0,
    delivered: 0,
    queued: 0,
    failed: 0,
    accepted: 0,
    duplicates: 0,
    rejected: 0,
    errors: [],
  }
  await Promise.all(
    nodes.map((node) => {
      if (node.sim.isQuiet()) summary.quiet += 1
      return sendAll(node, outgoingFor(node, time), summary)
    }),
  )
  return summary
}

export function formatSummary(s: TickSummary, transport: 'mqtt' | 'http'): string {
  const verdict = transport === 'http' ? ` · accepted ${s.accepted} dup ${s.duplicates} rejected ${s.rejected}` : ''
  const queued = s.queued ? ` · queued ${s.queued}` : ''
  const failed = s.failed ? ` · failed ${s.failed} (${s.errors.slice(0, 2).join('; ')})` : ''
  return `tick ${s.tick} · sim ${s.simTime} · ${s.nodes} nodes (${s.quiet} quiet) · ${s.messages} messages / ${s.readings} readings · delivered ${s.delivered}${queued}${verdict}${failed}`
}

export interface LoopOptions {
  intervalS: number
  speed: number
  durationS: number | null
  once: boolean
  transport: 'mqtt' | 'http'
  log: (line: string) => void
  signal: AbortSignal
}

function pause(ms: number, signal: AbortSignal): Promise<void> {
  return new Promise((resolve) => {
    const timer = setTimeout(done, Math.max(0, ms))
    function done() {
      clearTimeout(timer)
      signal.removeEventListener('abort', done)
      resolve()
    }
    signal.addEventListener('abort', done, { once: true })
  })
}

/** Ticks every `intervalS` real seconds; simulated time advances by speed × the real time elapsed. */
export async function runLoop(nodes: SimulatedNode[], options: LoopOptions): Promise<number> {
  const startedAt = Date.now()
  let last = startedAt
  let tick = 0
  while (!options.signal.aborted) {
    const now = Date.now()
    const summary = await runTick(nodes, ++tick, ((now - last) / 1000) * options.speed, new Date(now))
    last = now
    options.log(formatSummary(summary, options.transport))
    if (options.once) break
    if (options.durationS !== null && (Date.now() - startedAt) / 1000 >= options.durationS) break
    const nextAt = startedAt + tick * options.intervalS * 1000
    const untilEnd = options.durationS === null ? Infinity : startedAt + options.durationS * 1000 - Date.now()
    await pause(Math.min(nextAt - Date.now(), untilEnd), options.signal)
  }
  return tick
}
