import { z } from 'zod'
import { emailSchema, passwordSchema } from './auth'
import { timeZoneSchema } from './common'

/** The first start of a business: its name, its owner, its first site. */
export const setupInputSchema = z.object({
  businessName: z.string().trim().min(1, 'required').max(120),
  ownerName: z.string().trim().min(1, 'required').max(120),
  email: emailSchema,
  password: passwordSchema,
  siteName: z.string().trim().min(1, 'required').max(120),
  timeZone: timeZoneSchema,
  /** The one-time code the server printed; needed only away from the server's own machine. */
  code: z.string().trim().max(64).optional(),
})
export type SetupInput = z.infer<typeof setupInputSchema>

export interface SetupState {
  /** No organisation exists yet: the setup page is open. */
  needed: boolean
  /** This caller is not on the server's own machine, so the printed setup code is asked for. */
  codeRequired: boolean
}

/** The first steps after setup, in the order the overview lists them. */
export const CHECKLIST_STEPS = ['tanks', 'device', 'roster', 'people', 'wall'] as const
export type ChecklistStep = (typeof CHECKLIST_STEPS)[number]
export const checklistStepSchema = z.object({ step: z.enum(CHECKLIST_STEPS) })

export interface ChecklistItem {
  step: ChecklistStep
  done: boolean
}
