import { DatabaseUnavailableError } from './batch-writer'

/** A device's current calibration of one metric: corrected = intercept + gain · raw. */
export type DeviceCorrection = { calibrationId: number; gain: number; intercept: number }
/** The current correction per metric of one device; empty for a device that calibrates itself. */
export type CorrectionLoader = (deviceId: number) => Promise<Map<string, DeviceCorrection>>

/**
 * Each device's current calibrations, loaded once and kept until a calibration of that device
 * changes (`calibration.changed`), so ingest pays no query per reading.
 */
export class CorrectionCache {
  private readonly byDevice = new Map<number, Promise<Map<string, DeviceCorrection>>>()

  constructor(private readonly load: CorrectionLoader) {}

  of(deviceId: number): Promise<Map<string, DeviceCorrection>> {
    let entry = this.byDevice.get(deviceId)
    if (!entry) {
      entry = this.load(deviceId).catch((error: unknown) => {
        // Not kept: the next message asks again once the database answers.
        if (this.byDevice.get(deviceId) === entry) this.byDevice.delete(deviceId)
        throw new DatabaseUnavailableError(error instanceof Error ? error.message : undefined)
      })
      this.byDevice.set(deviceId, entry)
    }
    return entry
  }

  forget(deviceId: number) {
    this.byDevice.delete(deviceId)
  }
}
