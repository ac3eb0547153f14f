import { setImmediate as nextTurn } from 'node:timers/promises'
import { Op } from 'sequelize'
import { evaluate, replay } from '@shared/rules/evaluate'
import { windowCovers, type MaintenanceSpan } from '@shared/rules/maintenance'
import { causeOf, kindOf, metricOfSpec } from '@shared/rules/kinds'
import type { RuleContext, RuleEvent, RuleState } from '@shared/rules/types'
import { initialRuleState } from '@shared/rules/types'
import type { TimedValue } from '@shared/rules/spike-filter'
import { createSpikeGate, withoutSpikes } from './spike-gate'
import type { AppContext } from '../context'
import type { StoredReading } from '../platform/events'
import { windowOfTanks } from '../readings'
import { RANK } from './incident-kit'
import { DEFAULT_SETTLE_MINUTES, type IncidentsService } from './incidents'
import { rulesService } from './watch-rules'
import { remindEndingSnoozes } from './snooze-reminders'
import { ruleContextFor, snoozeCovers } from './tank-context'

type EngineRule = {
  id: number
  name: string
  severity: 'warning' | 'alarm'
  spec: import('@shared/rules/schema').WatchRuleSpec
  metric: string
  tank: { id: number; siteId: number; organizationId: number }
  timeZone: string
  ctx: RuleContext
  /** Rules of the same condition on the same tank (a warning and an alarm level) share one incident. */
  ladderKey: string
}

type Slot = { rule: EngineRule; state: RuleState; incidentId: number | null; lastWrite: number }
type Window = MaintenanceSpan & { siteId: number; tankId: number | null; ruleId: number | null }

// How far past a rule's own window the rebuild reads, so a trip during up to two hours without an
// engine still opens at the moment it happened (longer outages open it when the engine returns).
const LOOKBACK_PAD_MS = 2 * 3600_000
const TOUCH_EVERY_MS = 60_000
// A batch of thousands of readings is evaluated in slices this long; between them the process
// answers its sockets (MQTT acknowledgements, live screens) instead of holding them for the whole batch.
const SLICE_MS = 10
const MAX_BACKLOG = 10_000
// A flap back that lasts this long is no longer a flap: it is mailed again (`common practice`).
const RECHECK_MIN_MS = 5 * 60_000

const settleMsOf = (rule: EngineRule) => (rule.spec.settleMinutes ?? DEFAULT_SETTLE_MINUTES) * 60_000
const recheckMsOf = (rule: EngineRule) => Math.max('holdMinutes' in rule.spec ? rule.spec.holdMinutes * 60_000 : 0, RECHECK_MIN_MS)

/** How far back a rule needs stored readings to rebuild its state (its kind says; an unknown kind throws). */
function lookbackMs(rule: EngineRule): number {
  return kindOf(rule.spec).lookbackMinutes(rule.spec) * 60_000 + LOOKBACK_PAD_MS
}

/**
 * The watch-rule engine: the pure evaluator from shared/rules driven by stored readings (pushed
 * by the ingest path, never queried per reading) and by a timer for holds, quiet rules and
 * escalations. Its state is rebuilt from stored readings and open incidents at every start.
 */
export function createRuleEngine(ctx: AppContext, incidents: IncidentsService, options: { now?: () => number } = {}) {
  const now = options.now ?? Date.now
  const slots = new Map<string, Slot>() // `${ruleId}:${tankId}`
  const byTankMetric = new Map<string, Slot[]>() // `${tankId}:${metric}`
  const ladders = new Map<string, Slot[]>()
  let windows: Window[] = []
  let snoozes: Array<{ tankId: number; window: Parameters<typeof snoozeCovers>[0] }> = []
  let queue: StoredReading[] = []
  // Per probe: the reading held back until the next says whether it was a spike.
  const spikes = createSpikeGate()
  let chain: Promise<void> = Promise.resolve()
  let running = false

  /** Work runs one piece at a time, in order, so the evaluator sees readings as they came. */
  const serial = (work: () => Promise<void>) => {
    chain = chain.then(work).catch((error) => ctx.logger.error({ err: error }, 'watch-rule engine step failed'))
    return chain
  }

  async function loadRules() {
    const effective = await rulesService(ctx).effectiveRules()
    const tankIds = [...new Set(effective.map((e) => e.tankId))]
    const tanks = await ctx.models.Tank.findAll({ where: { id: tankIds }, include: [{ association: 'site', attributes: ['timeZone'] }] })
    const devices = await ctx.models.Device.findAll({ where: { tankId: tankIds, revokedAt: null }, attributes: ['tankId', 'metrics', 'intervalSeconds'] })
    const reported = new Set(devices.flatMap((d) => d.metrics.map((m) => `${d.tankId}:${m}`)))
    const probeIntervalMs = new Map<string, number>()
    for (const d of devices)
      for (const m of d.metrics) probeIntervalMs.set(`${d.tankId}:${m}`, Math.max(probeIntervalMs.get(`${d.tankId}:${m}`) ?? 0, d.intervalSeconds * 1000))
    const tankById = new Map(tanks.map((t) => [t.id, t]))
    const rules: EngineRule[] = []
    for (const { rule, tankId } of effective) {
      const tank = tankById.get(tankId)
      if (!tank) continue
      const metric = metricOfSpec(rule.spec)
      // A quiet rule watches only what a device is meant to report.
      if (rule.spec.kind === 'quiet' && !reported.has(`${tankId}:${metric}`)) continue
      rules.push({
        id: rule.id,
        name: rule.name,
        severity: rule.severity,
        spec: rule.spec,
        metric,
        tank: { id: tank.id, siteId: tank.siteId, organizationId: tank.organizationId },
        timeZone: tank.site?.timeZone ?? 'UTC',
        ladderKey: `${tank.id}:${rule.spec.kind}:${metric}`,
        ctx: {
          ...ruleContextFor({ heater: tank.heater, lightSchedule: tank.lightSchedule, timeZone: tank.site?.timeZone ?? 'UTC' }),
          probeIntervalMs: probeIntervalMs.get(`${tankId}:${metric}`),
        },
      })
    }
    return rules
  }

  async function loadSnoozes() {
    const rows = await ctx.models.Snooze.findAll({
      where: { cancelledAt: null, [Op.or]: [{ endsAt: { [Op.gt]: new Date(now()) } }, { repeatUntil: { [Op.gt]: new Date(now()) } }] },
    })
    snoozes = rows.map((s) => ({ tankId: s.tankId, window: s }))
  }

  async function loadWindows() {
    const rows = await ctx.models.MaintenanceWindow.findAll({
      where: { cancelledAt: null, [Op.or]: [{ endsAt: null }, { endsAt: { [Op.gt]: new Date(now() - 86400_000) } }] },
    })
    const ms = (d: Date | null) => (d ? d.getTime() : null)
    windows = rows.map((w) => ({
      siteId: w.siteId,
      tankId: w.tankId,
      ruleId: w.ruleId,
      startsAt: ms(w.startsAt),
      endsAt: ms(w.endsAt),
      weekday: w.weekday,
      startMinute: w.startMinute,
      durationMinutes: w.durationMinutes,
    }))
  }

  /** Inside a maintenance window for its site, its tank or itself. */
  function inMaintenance(rule: { id: number; tankId: number; siteId: number }, timeZone: string, at: number) {
    return windows.some(
      (w) =>
        w.siteId === rule.siteId &&
        (w.tankId === null || w.tankId === rule.tankId) &&
        (w.ruleId === null || w.ruleId === rule.id) &&
        windowCovers(w, at, timeZone),
    )
  }

  /** Incidents opened during maintenance whose window is over while they still hold: tell people now. */
  async function endMaintenances(at: number) {
    const held = await ctx.models.Incident.findAll({
      where: { maintenance: true, state: { [Op.ne]: 'resolved' } },
      include: [{ association: 'site', attributes: ['timeZone'] }],
    })
    for (const i of held) {
      if (
        !inMaintenance(
          { id: i.ruleId ?? -1, tankId: i.tankId, siteId: i.siteId },
          (i as typeof i & { site?: { timeZone: string } }).site?.timeZone ?? 'UTC',
          at,
        )
      )
        await incidents.endMaintenance(i.id, at)
    }
  }

  function isSnoozed(rule: EngineRule, at: number) {
    const heaterAlarm = rule.spec.kind === 'heater_line' && rule.severity === 'alarm'
    return snoozes.some((s) => s.tankId === rule.tank.id && snoozeCovers(s.window, at) && (!heaterAlarm || s.window.includeHeaterLine))
  }

  /** Rebuilds every rule's state from stored readings, then squares it with the open incidents. */
  async function rebuild() {
    const rules = await loadRules()
    await loadSnoozes()
    await loadWindows()
    const open = await ctx.models.Incident.findAll({ where: { state: { [Op.ne]: 'resolved' } } })
    slots.clear()
    byTankMetric.clear()
    ladders.clear()
    const t = now()
    const history = await loadHistory(rules, t)
    const trips = new Map<Slot, RuleEvent>()
    for (const rule of rules) {
      const readings = history.get(`${rule.tank.id}:${rule.metric}`) ?? []
      const since = t - lookbackMs(rule)
      const { state, events } = replay(
        rule.spec,
        readings.filter((r) => r.at >= since),
        t,
        rule.ctx,
      )
      const slot: Slot = { rule, state, incidentId: null, lastWrite: 0 }
      const trip = [...events].reverse().find((e) => e.type === 'trip')
      if (state.status === 'tripped' && trip) trips.set(slot, trip)
      addSlot(`${rule.id}:${rule.tank.id}`, slot)
    }
    for (const ladder of ladders.values()) {
      const ids = new Set(ladder.map((s) => s.rule.id))
      const incident = open.find((i) => i.tankId === ladder[0].rule.tank.id && i.ruleId !== null && ids.has(i.ruleId))
      const tripped = ladder.filter((s) => s.state.status === 'tripped')
      if (incident) {
        for (const s of tripped) s.incidentId = incident.id
        if (tripped.length) continue
        // Resolve only on evidence: readings that show it cleared. No readings in the window says nothing.
        const own = ladder.find((s) => s.rule.id === incident.ruleId) ?? ladder[0]
        if (ladder.some((s) => s.state.lastReadingAt !== undefined)) {
          await incidents.resolveAutomatically(incident.id, t, own.state.lastValue, 'Cleared while the engine was stopped', settleMsOf(own.rule))
        } else {
          own.state = { ...own.state, status: 'tripped', since: incident.openedAt.getTime(), peakValue: incident.peakValue ?? own.state.lastValue }
          own.incidentId = incident.id
        }
      } else {
        // It tripped while the engine was stopped: open it now, at the time it tripped (the lower level first).
        for (const s of tripped.sort((a, b) => RANK[a.rule.severity] - RANK[b.rule.severity])) {
          const trip = trips.get(s)
          if (trip) await handle(s, trip)
        }
      }
    }
    // Incidents whose rule is gone or disabled are left for people to resolve.
  }

  function addSlot(key: string, slot: Slot) {
    slots.set(key, slot)
    const k = `${slot.rule.tank.id}:${slot.rule.metric}`
    const list = byTankMetric.get(k) ?? []
    list.push(slot)
    byTankMetric.set(k, list)
    const ladder = ladders.get(slot.rule.ladderKey) ?? []
    ladder.push(slot)
    ladders.set(slot.rule.ladderKey, ladder)
  }

  async function loadHistory(rules: EngineRule[], t: number) {
    const need = new Map<string, number>()
    for (const r of rules) {
      const k = `${r.tank.id}:${r.metric}`
      need.set(k, Math.max(need.get(k) ?? 0, lookbackMs(r)))
    }
    const history = new Map<string, Array<{ at: number; value: number; source: StoredReading['source'] }>>()
    const byMetric = new Map<string, { tankIds: number[]; ms: number }>()
    for (const [k, ms] of need) {
      const [tankId, metric] = k.split(':')
      const entry = byMetric.get(metric) ?? { tankIds: [], ms: 0 }
      entry.tankIds.push(Number(tankId))
      entry.ms = Math.max(entry.ms, ms)
      byMetric.set(metric, entry)
    }
    for (const [metric, { tankIds, ms }] of byMetric) {
      const rows = await windowOfTanks(ctx.sequelize, metric, tankIds, new Date(t - ms), new Date(t))
      for (const r of rows) {
        const k = `${r.tank_id}:${metric}`
        const list = history.get(k) ?? []
        list.push({ at: r.time.getTime(), value: r.value, source: r.source })
        history.set(k, list)
      }
    }
    // The rules never saw a probe's spikes; neither does the rebuild.
    for (const [k, list] of history) history.set(k, withoutSpikes(k.split(':')[1], list))
    return history
  }

  async function handle(slot: Slot, event: RuleEvent) {
    const { rule } = slot
    const ladder = ladders.get(rule.ladderKey) ?? [slot]
    if (event.type === 'trip') {
      const incident = await incidents.trip({
        rule,
        tank: rule.tank,
        at: event.at,
        since: event.since,
        value: event.value,
        snoozed: isSnoozed(rule, event.at),
        ladder: ladder.map((s) => s.rule.id),
        settleMs: settleMsOf(rule),
        recheckMs: recheckMsOf(rule),
        maintenance: inMaintenance({ id: rule.id, tankId: rule.tank.id, siteId: rule.tank.siteId }, rule.timeZone, event.at),
        cause: causeOf(rule.spec, event.value),
        detail: event.detail,
      })
      slot.incidentId = incident.id
    } else if (event.type === 'update' && slot.incidentId) {
      if (event.at - slot.lastWrite >= TOUCH_EVERY_MS) {
        slot.lastWrite = event.at
        await incidents.touch(slot.incidentId, event.value, event.peak, event.at)
      }
    } else if (event.type === 'clear' && slot.incidentId) {
      const incidentId = slot.incidentId
      slot.incidentId = null
      const still = ladder.filter((s) => s.incidentId === incidentId && s.state.status === 'tripped')
      if (!still.length) {
        await incidents.resolveAutomatically(incidentId, event.at, event.value, undefined, settleMsOf(rule))
        return
      }
      const top = still.reduce((a, b) => (RANK[b.rule.severity] > RANK[a.rule.severity] ? b : a))
      if (RANK[rule.severity] > RANK[top.rule.severity]) await incidents.lower(incidentId, top.rule.severity, top.rule.name, event.at)
    }
  }

  /** Resolved by hand while the condition still holds: the incident reopens at once. */
  const onIncidentChanged = ({ incidentId, state }: { incidentId: number; state: string }) => {
    if (!running || state !== 'resolved') return
    void serial(async () => {
      const holding = [...slots.values()].some((s) => s.incidentId === incidentId && s.state.status === 'tripped')
      if (holding) await incidents.reopenStillHolding(incidentId, now())
    })
  }

  async function step(slot: Slot, input: Parameters<typeof evaluate>[2]) {
    const result = evaluate(slot.rule.spec, slot.state, input, slot.rule.ctx)
    slot.state = result.state
    if (result.event) await handle(slot, result.event)
  }

  /** Readings to every rule of their tank and metric; evaluated in line, only a trip, update or clear waits for the database. */
  async function feed(slotsOfReading: Slot[], readings: TimedValue[], source: StoredReading['source']) {
    for (const reading of readings) {
      const input = { type: 'reading' as const, at: reading.at, value: reading.value, source }
      for (const slot of slotsOfReading) {
        const result = evaluate(slot.rule.spec, slot.state, input, slot.rule.ctx)
        slot.state = result.state
        if (result.event) await handle(slot, result.event)
      }
    }
  }

  /** Held readings whose successor never came go on: the probe may have stopped after a real step. */
  async function releaseHeld(at: number) {
    for (const [key, readings] of spikes.release(at)) {
      const slotsOfReading = byTankMetric.get(key)
      if (slotsOfReading) await feed(slotsOfReading, readings, 'device')
    }
  }

  const onStored = (rows: StoredReading[]) => {
    if (!running) return
    queue.push(...rows)
    void serial(async () => {
      const batch = queue.sort((a, b) => a.time.getTime() - b.time.getTime())
      queue = []
      let sliceStart = performance.now()
      for (let i = 0; i < batch.length; i++) {
        const r = batch[i]!
        // Behind by more than a backlog, the engine keeps the process to itself: readings then wait in
        // the devices and the network, not as an ever longer queue in this process's memory.
        if (performance.now() - sliceStart > SLICE_MS && batch.length - i + queue.length < MAX_BACKLOG) {
          await nextTurn()
          sliceStart = performance.now()
        }
        const key = `${r.tankId}:${r.metric}`
        const slotsOfReading = byTankMetric.get(key)
        if (!slotsOfReading) continue
        const reading = { at: r.time.getTime(), value: r.value }
        if (r.source !== 'device') {
          await feed(slotsOfReading, [reading], r.source)
          continue
        }
        await feed(slotsOfReading, spikes.pass(key, r.metric, reading), 'device')
      }
    })
  }
  const onRulesChanged = () => {
    if (running) void serial(rebuild)
  }

  return {
    /** Starts evaluating (called when this instance holds the engine lock). */
    async start() {
      running = true
      ctx.events.on('readings.stored', onStored)
      ctx.events.on('rules.changed', onRulesChanged)
      ctx.events.on('incident.changed', onIncidentChanged)
      await serial(rebuild)
    },
    async stop() {
      running = false
      ctx.events.off('readings.stored', onStored)
      ctx.events.off('rules.changed', onRulesChanged)
      ctx.events.off('incident.changed', onIncidentChanged)
      await chain
    },
    /** Hold times, quiet rules and escalations: called on a timer, or by tests with their clock. */
    tick(at = now()) {
      return serial(async () => {
        await releaseHeld(at)
        for (const slot of slots.values()) await step(slot, { type: 'tick', at })
        await endMaintenances(at)
        await incidents.processDue(at)
        await remindEndingSnoozes(ctx, at)
      })
    },
    reloadSnoozes: () => serial(loadSnoozes),
    reloadWindows: () => serial(loadWindows),
    /** Waits until everything queued so far has been evaluated. */
    settle: () => serial(async () => {}),
    stateOf(ruleId: number, tankId: number) {
      return slots.get(`${ruleId}:${tankId}`)?.state ?? initialRuleState()
    },
  }
}
export type RuleEngine = ReturnType<typeof createRuleEngine>
