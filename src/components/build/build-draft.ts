// The editable copy of a build plan: the schema's output shape, with empty number fields as ''.
import { buildPlanSchema, defaultBuildPlan, type BuildPlan } from '@shared/schemas/build'
import type { PublicTank } from '@shared/schemas/tanks'

export type BuildDraft = BuildPlan

/** A fresh copy to edit; a JSON round trip, since the plan may be a reactive proxy (which structuredClone refuses). */
export function draftFrom(tank: PublicTank, plan: BuildPlan | null): BuildDraft {
  return JSON.parse(JSON.stringify(plan ?? buildPlanSchema.parse(defaultBuildPlan(tank)))) as BuildDraft
}

/** v-text-field gives '' for an empty number field; the plan wants null there. */
export const toNullable = (value: unknown): number | null => (value === '' || value === null || value === undefined ? null : Number(value))
export const toNumber = (value: unknown): number => (value === '' || value === null || value === undefined ? Number.NaN : Number(value))
