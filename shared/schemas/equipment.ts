// The equipment and consumables API: a tank's devices' hardware with service intervals, a site's consumables.
import { z } from 'zod'
import { CONSUMABLE_KINDS, EQUIPMENT_KINDS, SERVICE_ACTIONS, type ConsumableKind, type EquipmentKind, type ServiceAction } from '../equipment/defaults'
import type { CareDue } from '../care/due'
import { localDateSchema } from './time'

export const equipmentInputSchema = z.object({
  kind: z.enum(EQUIPMENT_KINDS),
  name: z.string().trim().min(1, 'give it a name').max(120),
  /** Maker and model, tube length, anything that identifies it; free text. */
  model: z.string().trim().max(200).default(''),
  watts: z.number().positive('above zero').max(10000).nullable().default(null),
  installedOn: localDateSchema,
  /** Absent: the kind's default (shared/equipment/defaults.ts). */
  serviceAction: z.enum(SERVICE_ACTIONS).optional(),
  /** Absent: the kind's default; null: no service reminder. */
  serviceEveryDays: z.number().int().min(1, 'at least every day').max(3650).nullable().optional(),
  notes: z.string().trim().max(2000).default(''),
})
export type EquipmentInput = z.infer<typeof equipmentInputSchema>
export type EquipmentBody = z.input<typeof equipmentInputSchema>

export const equipmentUpdateSchema = equipmentInputSchema.omit({ kind: true }).extend({ retired: z.boolean() }).partial()
export type EquipmentUpdate = z.infer<typeof equipmentUpdateSchema>
export type EquipmentUpdateBody = z.input<typeof equipmentUpdateSchema>

export const equipmentReplaceSchema = z.object({
  /** The day the new part went in; today on the site's calendar when absent. */
  on: localDateSchema.optional(),
  model: z.string().trim().max(200).optional(),
  watts: z.number().positive('above zero').max(10000).nullable().optional(),
  notes: z.string().trim().max(500).default(''),
})
export type EquipmentReplace = z.infer<typeof equipmentReplaceSchema>
export type EquipmentReplaceBody = z.input<typeof equipmentReplaceSchema>

export const consumableInputSchema = z.object({
  kind: z.enum(CONSUMABLE_KINDS),
  name: z.string().trim().min(1, 'give it a name').max(120),
  unit: z.string().trim().min(1, 'say what it is counted in').max(20),
  quantity: z.number().min(0, 'zero or more').max(1_000_000),
  /** At or below this the stock shows as low in Care today. */
  lowAt: z.number().min(0).max(1_000_000).nullable().default(null),
  expiresOn: localDateSchema.nullable().default(null),
  notes: z.string().trim().max(2000).default(''),
})
export type ConsumableInput = z.infer<typeof consumableInputSchema>
export type ConsumableBody = z.input<typeof consumableInputSchema>
export const consumableUpdateSchema = consumableInputSchema.omit({ kind: true }).partial()
export type ConsumableUpdate = z.infer<typeof consumableUpdateSchema>
export type ConsumableUpdateBody = z.input<typeof consumableUpdateSchema>

export interface PublicEquipment {
  id: number
  tankId: number
  kind: EquipmentKind
  name: string
  model: string
  watts: number | null
  installedOn: string
  /** "2 years 3 months" on the site's calendar. */
  age: string
  serviceAction: ServiceAction
  serviceEveryDays: number | null
  /** The care task that reminds of the service, with its due state. */
  careTaskId: number | null
  lastServicedAt: string | null
  due: CareDue | null
  notes: string
  retiredAt: string | null
}

export interface PublicConsumable {
  id: number
  siteId: number
  kind: ConsumableKind
  name: string
  unit: string
  quantity: number
  lowAt: number | null
  expiresOn: string | null
  notes: string
  low: boolean
  expired: boolean
}

/** A consumable worth a look in Care today: low, expired, or both. */
export interface ConsumableAlert extends PublicConsumable {
  site: { id: number; name: string }
}

/** The heater of a tank, for a temperature incident: how long it has been in. */
export interface HeaterAge {
  name: string
  installedOn: string
  /** "Heater installed 2 years 3 months ago" */
  text: string
}
