import type { SpecOfKind, WatchRuleKind } from './schema'

/**
 * What an alert mail tells a keeper to do, by kind of rule: the trade's usual first response and
 * checks (`common practice`, not a published protocol). Heater and level alerts go with the
 * electrical caution, which defers to local codes and a licensed electrician.
 */
// Methods rather than function properties: one kind's advice then serves where any kind's is asked for.
export interface KindAdvice<K extends WatchRuleKind = WatchRuleKind> {
  /** The one thing to do first, for the mail's first line; `value` is the compared quantity. */
  firstStep(spec: SpecOfKind<K>, metric: string, value: number | null): string
  /** First things to look at, in order. */
  checks(spec: SpecOfKind<K>, metric: string): string[]
  /** The electrical caution goes with every alert of the kind, whatever its metric. */
  electricalCaution: boolean
}

const spaced = (metric: string) => metric.replace('_', ' ')

/** Above, below or outside a level: the advice depends on the metric and which side was crossed. */
export const levelAdvice = {
  firstStep(spec: SpecOfKind<'above' | 'below' | 'outside'>, metric: string, value: number | null) {
    if (metric === 'temperature') {
      const hot = spec.kind === 'above' || (spec.kind === 'outside' && value !== null && value > spec.max)
      return hot
        ? 'First: if the heater is stuck on, switch it off at the socket (dry hands) and check it is fully submerged.'
        : 'First: check the heater has power and its light is on, and whether the room has lost power.'
    }
    if (metric === 'water_level') return 'First: stop any draining, and switch heaters off at the socket before the water falls below them.'
    if (metric === 'ammonia' || metric === 'nitrite') return 'First: stop feeding and confirm with a test kit; a partial water change is the usual next step.'
    return `First: confirm the ${spaced(metric)} with a test kit before acting.`
  },
  checks(spec: SpecOfKind<'above' | 'below' | 'outside'>, metric: string) {
    if (metric === 'temperature') {
      return spec.kind === 'below'
        ? ['Is the heater on and its indicator lit? Is it set correctly?', 'Check the room temperature; cover the tank to hold heat.']
        : [
            'Is the heater stuck on? Unplug it if the water keeps warming.',
            'Check the room temperature, the lights and any sun on the tank.',
            'Float a sealed bag of cool water or add aeration; do not cool suddenly.',
          ]
    }
    return [`Confirm ${metric} with a test kit.`, 'A partial water change is the usual first step for water quality.']
  },
  electricalCaution: false,
} satisfies KindAdvice<'above' | 'below' | 'outside'>

export const rateAdvice: KindAdvice<'rate'> = {
  firstStep: (_spec, metric) =>
    metric === 'ph'
      ? 'First: test pH and KH with a test kit before dosing or changing water.'
      : `First: confirm the ${spaced(metric)} with a second instrument before acting.`,
  checks: (_spec, metric) =>
    metric === 'ph'
      ? ['Test pH and KH with a test kit to confirm.', 'A falling KH lets pH crash: consider a partial water change.', 'Check CO2 dosing, if any.']
      : [`Confirm ${metric} with a second instrument.`, 'Look for what changed: heater, room, water change, dosing.'],
  electricalCaution: false,
}

export const quietAdvice: KindAdvice<'quiet'> = {
  firstStep: () => 'First: look at the tank yourself (by eye and with a thermometer), then check the sensor node’s power and network.',
  checks: () => ['Is the sensor node powered and on the network?', 'Check the tank by eye and with a thermometer until readings return.'],
  electricalCaution: false,
}

export const heaterLineAdvice: KindAdvice<'heater_line'> = {
  firstStep: () => 'First: switch the heater off at the socket (dry hands), then find what is lowering the water and top it up.',
  checks: () => [
    'Is a water change or a leak lowering the level? Stop draining.',
    'Switch the heater off at the socket before it is exposed; switch it back on only once it is covered again.',
    'Top up with water of the tank’s temperature, with dechlorinator.',
  ],
  electricalCaution: true,
}

export const lightScheduleAdvice: KindAdvice<'light_schedule'> = {
  firstStep: () => 'First: check the light’s timer and its plug.',
  checks: () => ['Check the light timer and the light’s own controller.', 'Check the site’s clock and time zone.'],
  electricalCaution: false,
}

export const probeKitAdvice: KindAdvice<'probe_kit'> = {
  firstStep: () => 'First: calibrate the probe, then test the water again with the kit.',
  checks: () => [
    'Calibrate the probe (the device’s Calibration panel on the tank page), then test again.',
    'Check the test kit’s expiry date and follow its instructions exactly; a second kit settles which one is off.',
  ],
  electricalCaution: false,
}

export const stuckAdvice: KindAdvice<'stuck'> = {
  firstStep: () => 'First: check the probe is under water and clean, and look at the tank yourself until it moves again.',
  checks: () => [
    'Is the probe still under water and in a place with flow?',
    'Clean the probe; if it still does not move, its node or the probe may have failed.',
  ],
  electricalCaution: false,
}
