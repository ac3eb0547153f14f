import { z } from 'zod'
import { ruleSeveritySchema, watchRuleSpecSchema, type RuleSeverity, type WatchRuleSpec } from '../rules/schema'
import { instantSchema } from './time'

export const ruleInputSchema = z.object({
  name: z.string().trim().min(1, 'required').max(120),
  severity: ruleSeveritySchema,
  spec: watchRuleSpecSchema,
  enabled: z.boolean().default(true),
})
export type RuleInput = z.infer<typeof ruleInputSchema>

export const ruleUpdateSchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    severity: ruleSeveritySchema,
    spec: watchRuleSpecSchema,
    enabled: z.boolean(),
  })
  .partial()

export interface PublicRule {
  id: number
  scope: 'tank' | 'site'
  siteId: number
  tankId: number | null
  overridesRuleId: number | null
  name: string
  severity: RuleSeverity
  spec: WatchRuleSpec
  enabled: boolean
  /** For a site-wide rule listed on a tank: a tank rule replaces it there. */
  overriddenHere?: boolean
  /** Live state on this tank, when the engine is running. */
  status?: 'clear' | 'holding' | 'tripped'
}

export const snoozeInputSchema = z
  .object({
    reason: z.string().trim().min(3, 'say why').max(300),
    startsAt: instantSchema,
    endsAt: instantSchema,
    /** Repeat the same window every week until `repeatUntil`. */
    weekly: z.boolean().default(false),
    repeatUntil: instantSchema.optional(),
    /** Heater-line alarms are not snoozed unless this is set explicitly. */
    includeHeaterLine: z.boolean().default(false),
  })
  .refine((s) => new Date(s.endsAt) > new Date(s.startsAt), { message: 'must end after it starts', path: ['endsAt'] })
  .refine((s) => new Date(s.endsAt).getTime() - new Date(s.startsAt).getTime() <= 7 * 86400_000, {
    message: 'at most 7 days at a time',
    path: ['endsAt'],
  })
  .refine((s) => !s.weekly || !!s.repeatUntil, { message: 'a weekly snooze needs an end date', path: ['repeatUntil'] })
  .refine((s) => !s.repeatUntil || new Date(s.repeatUntil).getTime() - new Date(s.startsAt).getTime() <= 366 * 86400_000, {
    message: 'at most a year ahead',
    path: ['repeatUntil'],
  })
export type SnoozeInput = z.infer<typeof snoozeInputSchema>

export interface PublicSnooze {
  id: number
  tankId: number
  reason: string
  startsAt: string
  endsAt: string
  weekly: boolean
  repeatUntil: string | null
  includeHeaterLine: boolean
  createdBy: number | null
  cancelledAt: string | null
  /** What it silences, in words, for the snooze screen. */
  suppresses: string[]
}
