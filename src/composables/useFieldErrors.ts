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
