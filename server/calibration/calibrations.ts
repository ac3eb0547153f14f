import { conductivityFactor, phCalibration, temperatureOffset } from '@shared/calibration'
import type { CalibratedMetric, CalibrationInput, PublicCalibration } from '@shared/schemas/calibrations'
import type { Actor, UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest } from '../platform/errors'
import { perContext } from '../platform/per-context'
import type { Calibration } from '../models'
import { devicesService } from '../devices'
import { markDeviceTasksDone } from '../care'

export function presentCalibration(c: Calibration): PublicCalibration {
  return {
    id: c.id,
    deviceId: c.deviceId,
    metric: c.metric as CalibratedMetric,
    method: c.method,
    points: c.points,
    gain: c.gain,
    intercept: c.intercept,
    slopePercent: c.slopePercent,
    offsetMv: c.offsetMv,
    slopeOk: c.slopeOk,
    performedAt: c.performedAt.toISOString(),
    performedBy: c.performer ? { id: c.performer.id, name: c.performer.name } : null,
    notes: c.notes,
  }
}

/** What a calibration input computes to: the correction ingest applies and what the page shows. */
function compute(input: CalibrationInput) {
  try {
    switch (input.metric) {
      case 'ph': {
        const r = phCalibration(input.points)
        return {
          method: 'ph_buffers' as const,
          points: input.points,
          gain: r.gain,
          intercept: r.intercept,
          slopePercent: r.slopePercent,
          offsetMv: r.offsetMv,
          slopeOk: r.slopeOk,
        }
      }
      case 'temperature': {
        const r = temperatureOffset(input.referenceC, input.reading)
        return {
          method: 'offset' as const,
          points: { referenceC: input.referenceC, reading: input.reading },
          gain: r.gain,
          intercept: r.intercept,
          slopePercent: null,
          offsetMv: null,
          slopeOk: null,
        }
      }
      case 'conductivity': {
        const r = conductivityFactor(input.standard, input.reading)
        return {
          method: 'factor' as const,
          points: { standard: input.standard, reading: input.reading },
          gain: r.gain,
          intercept: r.intercept,
          slopePercent: null,
          offsetMv: null,
          slopeOk: null,
        }
      }
    }
  } catch (error) {
    if (error instanceof RangeError) throw badRequest(error.message, { points: error.message })
    throw error
  }
}

/** Probe calibrations of a device: recorded, listed, and applied to readings from then on (never to the past). */
export const calibrationsService = perContext((ctx: AppContext) => {
  const { models, events } = ctx
  const include = [{ association: 'performer', attributes: ['id', 'name'] }]

  return {
    async list(actor: Actor, deviceId: number) {
      const device = await devicesService(ctx).get(actor, deviceId)
      const rows = await models.Calibration.findAll({
        where: { deviceId: device.id },
        include,
        order: [
          ['performedAt', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: 200,
      })
      return rows.map(presentCalibration)
    },

    async record(actor: UserActor, deviceId: number, input: CalibrationInput) {
      const device = await devicesService(ctx).get(actor, deviceId)
      if (!device.metrics.includes(input.metric)) throw badRequest(`This device does not report ${input.metric}`, { metric: 'not reported by this device' })
      const computed = compute(input)
      const row = await models.Calibration.create({
        organizationId: actor.organizationId,
        deviceId: device.id,
        metric: input.metric,
        ...computed,
        performedAt: input.performedAt ? new Date(input.performedAt) : new Date(),
        performedBy: actor.userId,
        notes: input.notes,
      })
      events.emit('calibration.changed', { deviceId: device.id })
      await markDeviceTasksDone(ctx, device.id, row.performedAt, actor.userId)
      await row.reload({ include })
      return presentCalibration(row)
    },
  }
})
