import fc from 'fast-check'
import { QueryTypes, type Sequelize } from 'sequelize'
import type { Express } from 'express'
import { createServer } from 'node:http'
import request from 'supertest'
import { hostileBody, type FuzzBody } from './fuzz-values'
import { listenOnFreePort } from './ports'

type Method = 'post' | 'put' | 'patch'

export type FuzzRoute = {
  method: Method
  /** The concrete path under /api/v1, ids filled in. */
  path: string
  token?: string
  /** A body the route accepts (or one that fails only for a reason outside the body, e.g. a wrong password). */
  base: unknown
  /** Statuses the route documents; anything else (above all 500) fails the case. */
  allowed?: number[]
  /** Tables a rejected request may legitimately touch (e.g. a device's last error). */
  mayTouch?: string[]
  /** Field names a 400 may name besides the base body's keys (refinements on absent fields). */
  knownFields?: string[]
}

/** The documented answers for a body route: success, or one of the clear client errors. */
export const DOCUMENTED = [200, 201, 202, 204, 400, 403, 404, 409, 410, 413]
const ERROR_CODES_400 = ['invalid_input', 'invalid_json', 'invalid_message', 'bad_request']

/**
 * One fingerprint per table in a single query: the row count and the newest row version (`xmin`).
 * An insert raises the count, a delete lowers it, an update writes a row with a newer xmin.
 */
export async function tableSnapshot(sequelize: Sequelize, skip: string[] = []) {
  const tables = (
    await sequelize.query<{ name: string }>(`SELECT tablename AS name FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename`, {
      type: QueryTypes.SELECT,
    })
  )
    .map((r) => r.name)
    .filter((name) => !skip.includes(name))
  const parts = tables.map((name) => `'${name}', (SELECT count(*) || ':' || coalesce(max(x.xmin::text::bigint), 0) FROM "${name}" x)`)
  return async () => {
    const [row] = await sequelize.query<{ s: Record<string, string> }>(`SELECT json_build_object(${parts.join(', ')}) AS s`, {
      type: QueryTypes.SELECT,
    })
    return row.s
  }
}

const changedTables = (before: Record<string, string>, after: Record<string, string>) => Object.keys(before).filter((k) => before[k] !== after[k])

/** What is wrong with one answer, or null when it is one the contract allows. */
export function judgeAnswer(route: FuzzRoute, sent: FuzzBody, status: number, body: unknown): string | null {
  const allowed = [...(route.allowed ?? DOCUMENTED), ...(route.token ? [] : [401])]
  if (!allowed.includes(status)) return `status ${status} not in ${allowed.join('/')}`
  if (status < 400) return null
  const error = (body as { error?: { code?: unknown; message?: unknown; fields?: Record<string, string> } })?.error
  if (!error || typeof error.code !== 'string' || typeof error.message !== 'string' || !error.message) return 'no error shape'
  if (status !== 400) return null
  if (!ERROR_CODES_400.includes(error.code)) return `unexpected 400 code ${error.code}`
  if (error.code !== 'invalid_input') return null
  const fields = Object.keys(error.fields ?? {})
  if (!fields.length) return 'a 400 without fields'
  let sentKeys: string[] = []
  try {
    const parsed = sent.json === undefined ? {} : JSON.parse(sent.json)
    if (parsed && typeof parsed === 'object' && !Array.isArray(parsed)) sentKeys = Object.keys(parsed)
  } catch {
    /* not JSON: covered by invalid_json */
  }
  const baseKeys = route.base && typeof route.base === 'object' ? Object.keys(route.base) : []
  const known = new Set(['body', ...sentKeys, ...baseKeys, ...(route.knownFields ?? [])])
  const unnamed = fields.filter((f) => !known.has(f.split('.')[0]))
  if (unnamed.length) return `400 names fields the body does not have: ${unnamed.join(', ')}`
  return null
}

export type FuzzOutcome = { route: string; cases: number; failures: string[]; statuses: Record<number, number>; ms: number }

/** Sends `numRuns` hostile bodies to one route and checks every answer and the tables after each rejection. */
export async function fuzzRoute(
  app: Express,
  sequelize: Sequelize,
  route: FuzzRoute,
  options: { numRuns: number; seed?: number; settle?: () => Promise<unknown> },
): Promise<FuzzOutcome> {
  // Writes still pending from an earlier route (e.g. device status) must not count against this one.
  await options.settle?.()
  const started = Date.now()
  const snapshot = await tableSnapshot(sequelize, route.mayTouch)
  const name = `${route.method.toUpperCase()} ${route.path}`
  const outcome: FuzzOutcome = { route: name, cases: 0, failures: [], statuses: {}, ms: 0 }
  // One listening server for the whole route: supertest would otherwise open one per request.
  const server = createServer(app)
  const origin = await listenOnFreePort(server)
  // After a refused case the tables are known to be as they were, so that snapshot serves as the next "before".
  let known: Record<string, string> | null = null
  const oneCase = async (sent: FuzzBody) => {
    outcome.cases++
    const before = known ?? (await snapshot())
    known = null
    let req = request(origin)[route.method](`/api/v1${route.path}`)
    if (route.token) req = req.set('Authorization', `Bearer ${route.token}`)
    if (sent.json !== undefined) req = req.set('Content-Type', 'application/json').send(sent.json)
    const res = await req
    outcome.statuses[res.status] = (outcome.statuses[res.status] ?? 0) + 1
    let problem = judgeAnswer(route, sent, res.status, res.body)
    if (!problem && res.status >= 400) {
      const after = await snapshot()
      const touched = changedTables(before, after)
      if (touched.length) problem = `rejected with ${res.status} but changed ${touched.join(', ')}`
      else known = after
    }
    if (problem) {
      const answer = JSON.stringify(res.body).slice(0, 300)
      outcome.failures.push(`${name} [${sent.how}] → ${res.status} ${answer}: ${problem} — sent ${(sent.json ?? '').slice(0, 300)}`)
    }
  }
  try {
    await fc.assert(fc.asyncProperty(hostileBody(route.base), oneCase), { numRuns: options.numRuns, seed: options.seed })
  } finally {
    await new Promise((resolve) => server.close(resolve))
  }
  outcome.ms = Date.now() - started
  return outcome
}

/** One line per route for the test output: cases tried, failures, and the statuses seen. */
export function reportLine(o: FuzzOutcome) {
  const statuses = Object.entries(o.statuses)
    .map(([s, n]) => `${s}×${n}`)
    .join(' ')
  const first = o.failures
    .slice(0, 3)
    .map((f) => `\n  ✗ ${f}`)
    .join('')
  return `fuzz ${o.route}: ${o.cases} cases, ${o.failures.length} failures (${statuses}) in ${(o.ms / 1000).toFixed(1)} s${first}`
}
