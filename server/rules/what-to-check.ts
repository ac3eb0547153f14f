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
    case 'rate':
      return metric === 'ph'
        ? ['Test pH and KH with a test kit to confirm.', 'A falling KH lets pH crash: consider a partial water change.', 'Check CO2 dosing, if any.']
        : [`Confirm ${metric} with a second instrument.`, 'Look for what changed: heater, room, water change, dosing.']
    default:
      if (metric === 'temperature') {
        return spec.kind === 'below'
          ? ['Is the heater on and its indicator lit? Is it set correctly?', 'Check the room temperature; cover the tank to hold heat.']
          : ['Is the heater stuck on? Unplug it if the water keeps warming.', 'Check the room temperature, the lights and any sun on the tank.', 'Float a sealed bag of cool water or add aeration; do not cool suddenly.']
      }
      return [`Confirm ${metric} with a test kit.`, 'A partial water change is the usual first step for water quality.']
  }
}

/** Alerts about heaters and water level carry the electrical caution. */
export function needsElectricalCaution(spec: WatchRuleSpec, metric: string) {
  return spec.kind === 'heater_line' || metric === 'temperature' || metric === 'water_level'
}
