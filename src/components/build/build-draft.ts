// The editable copy of a build plan: the schema's output shape, with empty number fields as ''.
import { buildPlanSchema, defaultBuildPlan, type BuildPlan } from '@shared/schemas/build'
import type { PublicTank } from '@shared/schemas/tanks'

export type BuildDraft = BuildPlan

export function draftFrom(tank: PublicTank, plan: BuildPlan | null): BuildDraft {
  return structuredClone(plan ?? buildPlanSchema.parse(defaultBuildPlan(tank)))
}

/** v-text-field gives '' for an empty number field; the plan wants null there. */
export const toNullable = (value: unknown): number | null => (value === '' || value === null || value === undefined ? null : Number(value))
export const toNumber = (value: unknown): number => (value === '' || value === null || value === undefined ? Number.NaN : Number(value))
