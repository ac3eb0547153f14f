import type { MetricKey } from '@shared/metrics/registry'
import { KINDS, RULE_KINDS, kindEntry, type RuleFormField } from '@shared/rules/kinds'
import { DEFAULT_SETTLE_MINUTES, type MissingReading, type RuleSeverity, type WatchRuleKind } from '@shared/rules/schema'
import { ruleInputSchema, type PublicRule, type RuleInput } from '@shared/schemas/rules'
import { fieldErrors, friendlyIssues, type FieldErrors } from '@/composables/useFieldErrors'

/**
 * Every field a rule form can show, as typed text; which ones count depends on the kind (its
 * entry in shared/rules/kinds.ts). One box per spec field, whichever kinds share it, so switching
 * kind keeps what was typed.
 */
export type RuleDraft = {
  name: string
  severity: RuleSeverity
  enabled: boolean
  kind: WatchRuleKind
  metric: MetricKey
  /** Every kind: a trip this soon after a clear counts as a flap of the same incident. */
  settleMinutes: string
  missingReading: MissingReading
} & Record<RuleFormField, string>

export function emptyRuleDraft(): RuleDraft {
  const boxes = {} as Record<RuleFormField, string>
  for (const kind of RULE_KINDS) for (const field of KINDS[kind].fields) boxes[field.key] ??= field.initial
  return { name: '', severity: 'warning', enabled: true, kind: 'above', metric: 'temperature', ...boxes, settleMinutes: '30', missingReading: 'keep' }
}

const text = (value: number | undefined) => (value == null ? '' : String(value))

export function draftFromRule(rule: Pick<PublicRule, 'name' | 'severity' | 'enabled' | 'spec'>): RuleDraft {
  const draft: RuleDraft = { ...emptyRuleDraft(), name: rule.name, severity: rule.severity, enabled: rule.enabled, kind: rule.spec.kind }
  const spec = rule.spec
  if ('metric' in spec) draft.metric = spec.metric
  const values = spec as unknown as Record<RuleFormField, number | undefined>
  for (const field of kindEntry(spec.kind).fields) draft[field.key] = text(values[field.key])
  if (spec.settleMinutes !== undefined) draft.settleMinutes = text(spec.settleMinutes)
  if (spec.missingReading) draft.missingReading = spec.missingReading
  return draft
}

/** An empty box is "not given" (a default may apply); anything else must be a number. */
const numberOrUndefined = (value: string) => (value.trim() === '' ? undefined : Number(value.replace(',', '.')))

/** The spec as sent: only the fields of the chosen kind. */
export function specFromDraft(draft: RuleDraft): Record<string, unknown> {
  const kind = kindEntry(draft.kind)
  const spec: Record<string, unknown> = { kind: draft.kind }
  if (!kind.fixedMetric) spec.metric = draft.metric
  for (const field of kind.fields) spec[field.key] = numberOrUndefined(draft[field.key])
  // Sent only when they differ from what an absent value means, so a stored rule reads back unchanged.
  const settle = numberOrUndefined(draft.settleMinutes)
  if (settle !== DEFAULT_SETTLE_MINUTES) spec.settleMinutes = settle
  // A quiet rule is itself about missing readings.
  if (kind.asksMissingReading && draft.missingReading !== 'keep') spec.missingReading = draft.missingReading
  return spec
}

/** zod's limits in the form's words: "at least 0", "at most 10080". */
function ruleIssues(issue: Parameters<typeof friendlyIssues>[0] & { minimum?: unknown; maximum?: unknown; inclusive?: boolean }) {
  const friendly = friendlyIssues(issue)
  if (friendly) return friendly
  if (issue.code === 'too_small') return issue.inclusive === false ? `must be more than ${String(issue.minimum)}` : `must be at least ${String(issue.minimum)}`
  if (issue.code === 'too_big') {
    const limit = Number(issue.maximum)
    return limit === 7 * 24 * 60 ? `at most ${limit} minutes (7 days)` : `must be at most ${String(issue.maximum)}`
  }
  return undefined
}

export type DraftResult = { ok: true; input: RuleInput } | { ok: false; errors: FieldErrors }

/** Checked with the same schema the server uses; errors are keyed by form field (`holdMinutes`, `name`). */
export function parseRuleDraft(draft: RuleDraft): DraftResult {
  const parsed = ruleInputSchema.safeParse(
    { name: draft.name, severity: draft.severity, enabled: draft.enabled, spec: specFromDraft(draft) },
    { error: ruleIssues },
  )
  if (parsed.success) return { ok: true, input: parsed.data }
  const errors: FieldErrors = {}
  for (const [path, message] of Object.entries(fieldErrors(parsed.error))) errors[path.replace(/^spec\./, '')] ??= message
  return { ok: false, errors }
}

/** Server field errors (`spec.holdMinutes`) in the form's keys. */
export function draftErrors(fields: Record<string, string>): FieldErrors {
  return Object.fromEntries(Object.entries(fields).map(([key, message]) => [key.replace(/^spec\./, ''), message]))
}
