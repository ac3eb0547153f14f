import type { Request } from 'express'
import type { z } from 'zod'
import { badRequest, fromZod } from '../errors'

/** Parses one part of a request with a shared zod schema; a failure is a 400 naming the fields. */
export function parse<S extends z.ZodType>(schema: S, req: Request, where: 'body' | 'query' | 'params'): z.infer<S> {
  const result = schema.safeParse(req[where] ?? {})
  if (!result.success) throw fromZod(result.error, where)
  // Checked on what the schema kept, so the error names a real field (not an index of a stray array).
  const bad = findUnstorable(result.data)
  if (bad) throw badRequest(`${bad.path || where}: ${bad.problem}`, { [bad.path || where]: bad.problem })
  return result.data
}

/**
 * For PATCH bodies: zod 4 fills `.default()` values even inside `.partial()`, so a body naming one
 * field would otherwise reset every defaulted field. Only the keys the client sent are kept.
 */
export function parseChanges<S extends z.ZodType>(schema: S, req: Request): Partial<z.infer<S>> {
  const data = parse(schema, req, 'body') as Record<string, unknown>
  const sent: object = req.body && typeof req.body === 'object' ? req.body : {}
  return Object.fromEntries(Object.entries(data).filter(([key]) => Object.hasOwn(sent, key))) as Partial<z.infer<S>>
}

const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/

/** Why PostgreSQL cannot store a string as sent (jsonb refuses both; text would drop or alter them), or null. */
function unstorable(text: string): string | null {
  if (text.includes('\u0000')) return 'control character NUL is not allowed'
  if (LONE_SURROGATE.test(text)) return 'contains an unpaired UTF-16 surrogate (not valid Unicode text)'
  return null
}

/** The first string or key PostgreSQL cannot store, with its path; null when everything can be stored. */
function findUnstorable(value: unknown, path: string[] = []): { path: string; problem: string } | null {
  if (typeof value === 'string') {
    const problem = unstorable(value)
    return problem ? { path: path.join('.'), problem } : null
  }
  if (value && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) {
      const keyProblem = unstorable(key)
      if (keyProblem) return { path: [...path, key.replace(/[\u0000\ud800-\udfff]/g, '?')].join('.'), problem: `key ${keyProblem}` }
      // The path is kept as steps, so an empty key is not swallowed into its parent's name.
      const found = findUnstorable(inner, [...path, key])
      if (found) return found
    }
  }
  return null
}
