import type { Request } from 'express'
import type { z } from 'zod'
import { fromZod } from '../errors'

/** Parses one part of a request with a shared zod schema; a failure is a 400 naming the fields. */
export function parse<S extends z.ZodType>(schema: S, req: Request, where: 'body' | 'query' | 'params'): z.infer<S> {
  const result = schema.safeParse(req[where] ?? {})
  if (!result.success) throw fromZod(result.error, where)
  return result.data
}
