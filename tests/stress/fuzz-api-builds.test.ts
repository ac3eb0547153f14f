// Property-based fuzzing of the build routes' JSON bodies (the same checks as tests/helpers/fuzz-routes.ts).
// Not repeated here: who may call them (build-roles.test.ts) and the worked figures (tests/unit/build).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank } from '../helpers/app'
import { localDaysAgo, PLAN_60, TANK_60 } from '../helpers/build-plan'
import { fuzzRoute, reportLine, type FuzzRoute } from '../helpers/fuzz-http'
import { buildFuzzWorld, type FuzzWorld } from '../helpers/fuzz-world'

const NUM_RUNS = Number(process.env.FUZZ_RUNS ?? 60)
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined
let w: FuzzWorld
let planned: number
let filled: number

beforeAll(async () => {
  w = await buildFuzzWorld()
  const make = async (name: string) => {
    const res = await w.t
      .api()
      .post('/api/v1/tanks')
      .set(bearer(w.owner))
      .send(sampleTank(w.siteId, { name, dimensions: TANK_60, heater: null }))
    expect(res.status).toBe(201)
    expect((await w.t.api().put(`/api/v1/tanks/${res.body.id}/build/plan`).set(bearer(w.owner)).send(PLAN_60)).status).toBe(200)
    return res.body.id as number
  }
  planned = await make('Fuzz planned build')
  filled = await make('Fuzz filled build')
  expect(
    (
      await w.t
        .api()
        .post(`/api/v1/tanks/${filled}/build/start`)
        .set(bearer(w.owner))
        .send({ filledOn: localDaysAgo('Europe/Berlin', 3) })
    ).status,
  ).toBe(200)
})
afterAll(() => w?.t.close())

describe('hostile JSON bodies: builds', () => {
  it('answers each with a documented status and a clear error, and writes nothing when it refuses', { timeout: 600_000 }, async () => {
    const routes: FuzzRoute[] = [
      {
        method: 'put',
        path: `/tanks/${w.careTankId}/build/plan`,
        token: w.keeper,
        base: PLAN_60,
        knownFields: [
          'material',
          'depthCm',
          'fillHeightCm',
          'substrateDepthCm',
          'hardscapeLitres',
          'heater.topCm',
          'setPointC',
          'roomC',
          'glassThicknessMm',
          'densityKgPerL',
          'bagLitres',
          'kg',
          'litres',
          'labelRate.amount',
        ],
      },
      { method: 'post', path: `/tanks/${planned}/build/start`, token: w.keeper, base: { filledOn: localDaysAgo('Europe/Berlin', 2) } },
      {
        method: 'post',
        path: `/tanks/${filled}/build/steps/conditioner/done`,
        token: w.keeper,
        base: { notes: 'conditioner in', at: new Date(Date.now() - 60_000).toISOString() },
      },
      { method: 'post', path: `/tanks/${planned}/build/report/mail`, token: w.keeper, base: { emails: ['client@fuzz.example'] } },
    ]
    const failures: string[] = []
    let cases = 0
    for (const route of routes) {
      const outcome = await fuzzRoute(w.t.app, w.t.ctx.sequelize, route, { numRuns: NUM_RUNS, seed: SEED, settle: () => w.t.ctx.readings.status.flush() })
      console.log(reportLine(outcome))
      cases += outcome.cases
      failures.push(...outcome.failures)
    }
    console.log(`fuzz builds: ${routes.length} routes, ${cases} cases, ${failures.length} failures`)
    expect(failures.slice(0, 10)).toEqual([])
    expect((await w.t.api().get('/api/v1/health')).status).toBe(200)
  })
})
