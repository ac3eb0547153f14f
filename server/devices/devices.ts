import { isDeviceQuiet, type DeviceInput, type PublicDevice } from '@shared/schemas/devices'
import type { MetricKey } from '@shared/metrics/registry'
import type { Actor } from '../access/actor'
import { hashSecret } from '../access/tokens'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import type { Device } from '../models'
import { brokerAddress } from './broker-address'
import { newDeviceToken } from './device-tokens'
import { tankScope, visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'
import { countsBySourceKey } from '../readings'

export const devicesService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx
  const include = [{ association: 'tank', attributes: ['id', 'name', 'siteId'] }]

  async function readingsSince(deviceIds: number[], since: Date) {
    if (!deviceIds.length) return new Map<number, number>()
    const counts = await countsBySourceKey(
      sequelize,
      deviceIds.map((id) => `d:${id}`),
      since,
    )
    return new Map([...counts].map(([key, n]) => [Number(key.slice(2)), n]))
  }

  function publicDevice(d: Device, readingsToday: number): PublicDevice {
    return {
      id: d.id,
      tankId: d.tankId,
      tankName: d.tank?.name ?? '',
      siteId: d.tank?.siteId ?? 0,
      name: d.name,
      metrics: d.metrics as MetricKey[],
      intervalSeconds: d.intervalSeconds,
      lastSeenAt: d.lastSeenAt?.toISOString() ?? null,
      lastError: d.lastError ?? null,
      lastErrorAt: d.lastErrorAt?.toISOString() ?? null,
      rejectedCount: Number(d.rejectedCount),
      readingsToday,
      quiet: isDeviceQuiet(d),
      revokedAt: d.revokedAt?.toISOString() ?? null,
      selfCalibrating: d.selfCalibrating,
      createdAt: d.createdAt.toISOString(),
    }
  }

  async function present(devices: Device[]) {
    // "Today" is the last 24 hours: sites of one organization can sit in different zones.
    const counts = await readingsSince(
      devices.map((d) => d.id),
      new Date(Date.now() - 86400_000),
    )
    return devices.map((d) => publicDevice(d, counts.get(d.id) ?? 0))
  }

  async function find(actor: Actor, id: number) {
    const device = await models.Device.findOne({ where: { id, organizationId: actor.organizationId }, include })
    if (!device) throw notFound('Device not found')
    await visibleTank(ctx, actor, device.tankId) // a limited viewer sees devices of its sites only
    return device
  }

  return {
    async list(actor: Actor, tankId?: number) {
      const where: Record<string, unknown> = { organizationId: actor.organizationId }
      if (tankId) where.tankId = (await visibleTank(ctx, actor, tankId)).id
      else if (actor.siteIds) {
        const visible = await models.Tank.findAll({ where: tankScope(actor), attributes: ['id'] })
        where.tankId = visible.map((t) => t.id)
      }
      const devices = await models.Device.findAll({
        where,
        include,
        order: [
          ['name', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      return present(devices)
    },

    async get(actor: Actor, id: number) {
      return (await present([await find(actor, id)]))[0]
    },

    async create(actor: Actor, input: DeviceInput) {
      const tank = await visibleTank(ctx, actor, input.tankId)
      const placeholder = await models.Device.create({
        ...input,
        tankId: tank.id,
        organizationId: actor.organizationId,
        tokenHash: 'pending',
      })
      const { token, hash } = newDeviceToken(placeholder.id)
      await placeholder.update({ tokenHash: hash })
      await ctx.events.settle('device.created', {
        id: placeholder.id,
        organizationId: actor.organizationId,
        siteId: tank.siteId,
        tankId: tank.id,
        name: placeholder.name,
        metrics: placeholder.metrics as MetricKey[],
        selfCalibrating: placeholder.selfCalibrating,
      })
      return { device: (await present([await find(actor, placeholder.id)]))[0], token, broker: brokerAddress(ctx.config.mqtt) }
    },

    async update(actor: Actor, id: number, changes: Partial<Omit<DeviceInput, 'tankId'>>) {
      const device = await find(actor, id)
      await device.update(changes)
      if (changes.selfCalibrating !== undefined) ctx.events.emit('calibration.changed', { deviceId: device.id })
      return (await present([device]))[0]
    },

    /** A new token; the old one stops working at once, and a live MQTT connection with it is cut. */
    async rotate(actor: Actor, id: number) {
      const device = await find(actor, id)
      const { token, hash } = newDeviceToken(device.id)
      await device.update({ tokenHash: hash, revokedAt: null })
      ctx.events.emit('device.revoked', { deviceId: device.id })
      return { device: (await present([device]))[0], token, broker: brokerAddress(ctx.config.mqtt) }
    },

    async revoke(actor: Actor, id: number) {
      const device = await find(actor, id)
      await device.update({ revokedAt: new Date(), tokenHash: hashSecret(`revoked:${Date.now()}:${Math.random()}`) })
      ctx.events.emit('device.revoked', { deviceId: device.id })
      return (await present([device]))[0]
    },
  }
})
