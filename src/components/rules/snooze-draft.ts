import { snoozeInputSchema, type SnoozeInput } from '@shared/schemas/rules'
import { fieldErrors, friendlyIssues, type FieldErrors } from '@/composables/useFieldErrors'
import { fromLocalInputValue, toLocalInputValue } from '@shared/time'

export const MAX_SNOOZE_DAYS = 7

/** Said before saving, so nobody silences the one alarm that protects the heater by accident. */
export const HEATER_LINE_STATEMENT = 'Heater-line alarms are still sent unless you tick ‘Also silence heater-line alarms’.'
export const HEATER_LINE_WARNING =
  'Nobody will be told if the water falls to the heater top. A heater running out of water can crack or burn: only tick this while the heater is unplugged.'

/** The form as typed: `datetime-local` and `date` values in the viewer's own zone. */
export interface SnoozeDraft {
  reason: string
  startsAt: string
  endsAt: string
  weekly: boolean
  repeatUntil: string
  includeHeaterLine: boolean
}

export function newSnoozeDraft(now = new Date()): SnoozeDraft {
  return {
    reason: '',
    startsAt: toLocalInputValue(now),
    endsAt: toLocalInputValue(new Date(now.getTime() + 2 * 3600_000)),
    weekly: false,
    repeatUntil: '',
    includeHeaterLine: false,
  }
}

/** The end of the chosen day in the viewer's zone: "until 30 June" includes 30 June. */
function endOfLocalDay(date: string): Date | null {
  const day = fromLocalInputValue(`${date}T23:59`)
  return day ? new Date(day.getTime() + 59_000) : null
}

export type SnoozeDraftResult = { ok: true; input: SnoozeInput } | { ok: false; errors: FieldErrors }

export function parseSnoozeDraft(draft: SnoozeDraft): SnoozeDraftResult {
  const starts = fromLocalInputValue(draft.startsAt)
  const ends = fromLocalInputValue(draft.endsAt)
  const until = draft.weekly && draft.repeatUntil ? endOfLocalDay(draft.repeatUntil) : null
  const parsed = snoozeInputSchema.safeParse(
    {
      reason: draft.reason,
      startsAt: starts?.toISOString(),
      endsAt: ends?.toISOString(),
      weekly: draft.weekly,
      repeatUntil: until?.toISOString(),
      includeHeaterLine: draft.includeHeaterLine,
    },
    { error: friendlyIssues },
  )
  return parsed.success ? { ok: true, input: parsed.data } : { ok: false, errors: fieldErrors(parsed.error) }
}
