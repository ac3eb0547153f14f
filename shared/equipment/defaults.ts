// What each kind of equipment needs and how often. Every interval here is `common practice`
// among keepers, not a maker's figure: follow the product's own manual where it says otherwise.

export const EQUIPMENT_KINDS = ['heater', 'lamp', 'pump', 'filter', 'probe'] as const
export type EquipmentKind = (typeof EQUIPMENT_KINDS)[number]

export const SERVICE_ACTIONS = ['replace', 'service', 'check'] as const
export type ServiceAction = (typeof SERVICE_ACTIONS)[number]

export interface ServiceDefault {
  action: ServiceAction
  everyDays: number
  /** The care task's wording, before the equipment's name. */
  task: string
  /** Where the default comes from, shown beside it on the form. */
  basis: string
}

/** common practice: lamp tubes yearly, impellers every 3 months, heaters checked monthly, probes cleaned and calibrated monthly. */
export const SERVICE_DEFAULTS: Record<EquipmentKind, ServiceDefault> = {
  heater: {
    action: 'check',
    everyDays: 30,
    task: 'Check the heater (thermometer agrees with the set point, cable and seal intact)',
    basis: 'common practice: monthly',
  },
  lamp: { action: 'replace', everyDays: 365, task: 'Replace the lamp tube', basis: 'common practice: tubes lose light output within about a year' },
  pump: { action: 'service', everyDays: 91, task: 'Clean the pump impeller', basis: 'common practice: every 3 months' },
  filter: { action: 'service', everyDays: 91, task: 'Clean the filter impeller and hoses', basis: 'common practice: every 3 months' },
  probe: { action: 'service', everyDays: 30, task: 'Clean and calibrate the probe', basis: 'common practice: monthly' },
}

export const EQUIPMENT_KIND_LABELS: Record<EquipmentKind, string> = {
  heater: 'Heater',
  lamp: 'Lamp',
  pump: 'Pump',
  filter: 'Filter',
  probe: 'Probe',
}

/** Mains equipment in or over water: shown wherever equipment is handled. */
export const MAINS_CAUTION =
  'Heaters, pumps and lamps run on mains electricity beside water. Unplug everything before your hands go in the tank, ' +
  'keep drip loops on every cable, and run the tank on a residual-current device (RCD/GFCI). Wiring work is for a licensed ' +
  'electrician; local electrical codes come first. Let a heater cool before lifting it out of the water.'

export const CONSUMABLE_KINDS = ['filter_media', 'carbon', 'salt', 'reagent', 'other'] as const
export type ConsumableKind = (typeof CONSUMABLE_KINDS)[number]
export const CONSUMABLE_KIND_LABELS: Record<ConsumableKind, string> = {
  filter_media: 'Filter media',
  carbon: 'Carbon',
  salt: 'Salt',
  reagent: 'Test-kit reagent',
  other: 'Other',
}
