import type { Request } from 'express'
import type { z } from 'zod'
import { fromZod } from '../errors'

/** Parses one part of a request with a shared zod schema; a failure is a 400 naming the fields. */
export function parse<S extends z.ZodType>(schema: S, req: Request, where: 'body' | 'query' | 'params'): z.infer<S> {
  const result = schema.safeParse(req[where] ?? {})
  if (!result.success) throw fromZod(result.error, where)
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
