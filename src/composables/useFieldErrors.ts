import { ref, watch } from 'vue'
import type { z } from 'zod'

/** Field path (`heater.topCm`) → the first message for it; `_form` for whole-object issues. */
export type FieldErrors = Record<string, string>

export function fieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {}
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join('.') : '_form'
    out[key] ??= issue.message
  }
  return out
}

/**
 * Messages for empty or non-numeric inputs, in the form's words rather than zod's defaults;
 * messages written in the schemas themselves still win.
 */
export const friendlyIssues = (issue: { code?: string; input?: unknown; expected?: unknown }) => {
  if (issue.code === 'invalid_type') {
    if (issue.input === undefined || issue.input === null || issue.input === '') return 'required'
    if (issue.expected === 'number') return 'enter a number'
  }
  return undefined
}

// A chosen file has no JSON form of its own; its name, size and date tell one choice from another.
const snapshot = (value: unknown) =>
  JSON.stringify(value, (_key, v: unknown) => (typeof File !== 'undefined' && v instanceof File ? `file:${v.name}:${v.size}:${v.lastModified}` : v))

/**
 * A form's field errors: its own checks (`show`) and the server's (`server`, usually the
 * `serverErrors` prop a list passes down), one set on screen. A field's message goes as soon as
 * that field changes (`heater.topCm` goes with `heater`; a whole-form `_form` message with any field),
 * so nobody reads an error about a value they have already corrected.
 */
export function useFieldErrors(fields: () => Record<string, unknown>, server: () => FieldErrors | undefined = () => undefined) {
  const errors = ref<FieldErrors>({})

  watch(server, (next) => (errors.value = { ...next }))

  let before = new Map(Object.entries(fields()).map(([key, value]) => [key, snapshot(value)]))
  watch(
    fields,
    (now) => {
      const after = new Map(Object.entries(now).map(([key, value]) => [key, snapshot(value)]))
      const changed = [...after.keys()].filter((key) => after.get(key) !== before.get(key))
      before = after
      if (!changed.length) return
      const kept = Object.entries(errors.value).filter(([path]) => path !== '_form' && !changed.some((key) => path === key || path.startsWith(`${key}.`)))
      if (kept.length !== Object.keys(errors.value).length) errors.value = Object.fromEntries(kept)
    },
    { deep: true },
  )

  return {
    errors,
    /** Replaces every message with these (the form's own check before sending). */
    show(problems: FieldErrors) {
      errors.value = { ...problems }
    },
    clear() {
      errors.value = {}
    },
  }
}
