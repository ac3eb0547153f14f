import type { Request } from 'express'
import type { z } from 'zod'
import { badRequest, fromZod } from '../errors'

/** Parses one part of a request with a shared zod schema; a failure is a 400 naming the fields. */
export function parse<S extends z.ZodType>(schema: S, req: Request, where: 'body' | 'query' | 'params'): z.infer<S> {
  const result = schema.safeParse(req[where] ?? {})
  if (!result.success) throw fromZod(result.error, where)
  // Checked on what the schema kept, so the error names a real field (not an index of a stray array).
  const nul = findNul(result.data)
  if (nul !== null) throw badRequest(`${nul || where}: control character NUL is not allowed`, { [nul || where]: 'contains a NUL character' })
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

/** PostgreSQL text and jsonb cannot hold NUL; the path of the first string or key containing one, else null. */
function findNul(value: unknown, path: string[] = []): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path.join('.') : null
  if (value && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) {
      if (key.includes('\u0000')) return [...path, key.replaceAll('\u0000', '\\0')].join('.')
      // The path is kept as steps, so an empty key is not swallowed into its parent's name.
      const found = findNul(inner, [...path, key])
      if (found !== null) return found
    }
  }
  return null
}
