import type { CareTaskDraft } from '../care/defaults'

/** `common practice`: calibrate a pH probe about every four weeks (more often when readings drift). */
export const PH_CALIBRATION_DAYS = 28

/** The care task a pH probe brings to its tank; recording a calibration of the probe ticks it off. */
export function phCalibrationTask(deviceName: string): CareTaskDraft {
  return { kind: 'other', title: `Calibrate the pH probe (${deviceName})`, recurrence: { kind: 'interval', everyDays: PH_CALIBRATION_DAYS }, defaultValues: {} }
}
