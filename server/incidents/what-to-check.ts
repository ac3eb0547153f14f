import type { WatchRuleSpec } from '@shared/rules/schema'

/** First things a keeper should look at, by kind of rule (the trade's usual checks, `common practice`). */
export function whatToCheck(spec: WatchRuleSpec, metric: string): string[] {
  switch (spec.kind) {
    case 'heater_line':
      return [
        'Is a water change or a leak lowering the level? Stop draining.',
        'Switch the heater off at the socket before it is exposed; switch it back on only once it is covered again.',
        'Top up with water of the tank’s temperature, with dechlorinator.',
      ]
    case 'quiet':
      return ['Is the sensor node powered and on the network?', 'Check the tank by eye and with a thermometer until readings return.']
    case 'light_schedule':
      return ['Check the light timer and the light’s own controller.', 'Check the site’s clock and time zone.']
    case 'probe_kit':
      return [
        'Calibrate the probe (the device’s Calibration panel on the tank page), then test again.',
        'Check the test kit’s expiry date and follow its instructions exactly; a second kit settles which one is off.',
      ]
    case 'stuck':
      return ['Is the probe still under water and in a place with flow?', 'Clean the probe; if it still does not move, its node or the probe may have failed.']
    case 'rate':
      return metric === 'ph'
        ? ['Test pH and KH with a test kit to confirm.', 'A falling KH lets pH crash: consider a partial water change.', 'Check CO2 dosing, if any.']
        : [`Confirm ${metric} with a second instrument.`, 'Look for what changed: heater, room, water change, dosing.']
    default:
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
  }
}

/** Alerts about heaters and water level carry the electrical caution. */
export function needsElectricalCaution(spec: WatchRuleSpec, metric: string) {
  return spec.kind === 'heater_line' || metric === 'temperature' || metric === 'water_level'
}

/**
 * The one thing to do first, for the first line of an alert mail: the trade's usual first
 * response to each kind of rule (`common practice`, not a published protocol). Heater and level
 * lines go with the electrical caution, which defers to local codes and a licensed electrician.
 */
export function firstStep(spec: WatchRuleSpec, metric: string, value: number | null): string {
  switch (spec.kind) {
    case 'heater_line':
      return 'First: switch the heater off at the socket (dry hands), then find what is lowering the water and top it up.'
    case 'quiet':
      return 'First: look at the tank yourself (by eye and with a thermometer), then check the sensor node’s power and network.'
    case 'light_schedule':
      return 'First: check the light’s timer and its plug.'
    case 'probe_kit':
      return 'First: calibrate the probe, then test the water again with the kit.'
    case 'stuck':
      return 'First: check the probe is under water and clean, and look at the tank yourself until it moves again.'
    case 'rate':
      return metric === 'ph'
        ? 'First: test pH and KH with a test kit before dosing or changing water.'
        : `First: confirm the ${metric.replace('_', ' ')} with a second instrument before acting.`
    default: {
      if (metric === 'temperature') {
        const hot = spec.kind === 'above' || (spec.kind === 'outside' && value !== null && value > spec.max)
        return hot
          ? 'First: if the heater is stuck on, switch it off at the socket (dry hands) and check it is fully submerged.'
          : 'First: check the heater has power and its light is on, and whether the room has lost power.'
      }
      if (metric === 'water_level') return 'First: stop any draining, and switch heaters off at the socket before the water falls below them.'
      if (metric === 'ammonia' || metric === 'nitrite') return 'First: stop feeding and confirm with a test kit; a partial water change is the usual next step.'
      return `First: confirm the ${metric.replace('_', ' ')} with a test kit before acting.`
    }
  }
}
