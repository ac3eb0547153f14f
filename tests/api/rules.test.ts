import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { rulesService } from '../../server/incidents/watch-rules'
import type { PublicRule } from '@shared/schemas/rules'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg
let owner: Record<string, string>

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Rules Org')
  other = await t.createOrg('Other Rules Org')
  owner = bearer(org.users.owner.token)
})
afterAll(() => t.close())

const as = (role: 'owner' | 'keeper' | 'viewer', of = org) => bearer(of.users[role].token)
async function newTank(siteId = org.siteIds[0], overrides: Record<string, unknown> = {}) {
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(owner)
    .send(sampleTank(siteId, { name: `Tank ${Math.random()}`, ...overrides }))
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.id as number
}
const tankRules = async (tankId: number, auth = owner) => {
  const res = await t.api().get(`/api/v1/tanks/${tankId}/rules`).set(auth)
  expect(res.status).toBe(200)
  return res.body as PublicRule[]
}
const addTankRule = (tankId: number, body: object, auth = owner) => t.api().post(`/api/v1/tanks/${tankId}/rules`).set(auth).send(body)
const addSiteRule = (siteId: number, body: object, auth = owner) => t.api().post(`/api/v1/sites/${siteId}/rules`).set(auth).send(body)
const override = (tankId: number, ruleId: number, body: object, auth = owner) =>
  t.api().put(`/api/v1/tanks/${tankId}/rules/${ruleId}/override`).set(auth).send(body)
/** Which rule ids the engine would watch each tank with. */
async function effective(tankIds: number[]) {
  const rows = await rulesService(t.ctx).effectiveRules({ tankIds })
  return Object.fromEntries(
    tankIds.map((id) => [
      id,
      rows
        .filter((r) => r.tankId === id)
        .map((r) => r.rule.id)
        .sort((a, b) => a - b),
    ]),
  )
}
const phLow = { name: 'pH below 6.4', severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6.4, holdMinutes: 30 } }

describe('default rules of a new tank', () => {
  // The starter thresholds are common practice (see shared/rules/defaults.ts): the 24–28 °C band is
  // the tropical default target (common practice), held 10 min with 0.5 °C of hysteresis.
  it('gives a tank with a heater the temperature, heater-line, quiet and pH-drift rules', async () => {
    const tankId = await newTank()
    const rules = await tankRules(tankId)
    expect(rules.map((r) => [r.name, r.severity, r.scope, r.enabled])).toEqual([
      ['Temperature above 28 °C for 10 min', 'alarm', 'tank', true],
      ['Temperature below 24 °C for 10 min', 'alarm', 'tank', true],
      ['Water level within 2 cm of the heater top', 'warning', 'tank', true],
      ['Water level at or below the heater top', 'alarm', 'tank', true],
      ['No temperature reading for 15 min', 'warning', 'tank', true],
      ['pH changed by more than 0.3 in 24 h', 'warning', 'tank', true],
    ])
    expect(rules.map((r) => r.spec)).toEqual([
      { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
      { kind: 'below', metric: 'temperature', limit: 24, holdMinutes: 10, clearMargin: 0.5 },
      { kind: 'heater_line', marginCm: 2, holdMinutes: 0, clearMargin: 0.5 },
      { kind: 'heater_line', marginCm: 0, holdMinutes: 0, clearMargin: 0.5 },
      { kind: 'quiet', metric: 'temperature', quietMinutes: 15 },
      { kind: 'rate', metric: 'ph', maxChange: 0.3, windowMinutes: 1440 },
    ])
    expect(rules.every((r) => r.tankId === tankId && r.siteId === org.siteIds[0] && r.overridesRuleId === null)).toBe(true)
  })

  it('follows the tank’s own temperature targets and leaves out heater-line rules without a heater', async () => {
    const tankId = await newTank(org.siteIds[0], { heater: null, targets: { temperature: { min: 18, max: 22.5 } } })
    expect((await tankRules(tankId)).map((r) => r.name)).toEqual([
      'Temperature above 22.5 °C for 10 min',
      'Temperature below 18 °C for 10 min',
      'No temperature reading for 15 min',
      'pH changed by more than 0.3 in 24 h',
    ])
  })
})

describe('tank rules', () => {
  it('creates with defaults filled, changes only what is sent, disables and deletes', async () => {
    const tankId = await newTank()
    const defaults = (await tankRules(tankId)).map((r) => r.id)
    const created = await addTankRule(tankId, phLow)
    expect(created.status).toBe(201)
    expect(created.body).toEqual({
      id: expect.any(Number),
      scope: 'tank',
      siteId: org.siteIds[0],
      tankId,
      overridesRuleId: null,
      name: 'pH below 6.4',
      severity: 'warning',
      spec: { kind: 'below', metric: 'ph', limit: 6.4, holdMinutes: 30, clearMargin: 0 },
      enabled: true,
    })
    const id = created.body.id as number
    expect((await effective([tankId]))[tankId]).toEqual([...defaults, id])

    const renamed = await t.api().patch(`/api/v1/rules/${id}`).set(owner).send({ name: 'pH below 6.4 for half an hour' })
    expect(renamed.status).toBe(200)
    expect(renamed.body).toEqual({ ...created.body, name: 'pH below 6.4 for half an hour' })

    const disabled = await t.api().patch(`/api/v1/rules/${id}`).set(owner).send({ enabled: false })
    expect(disabled.body).toMatchObject({ enabled: false, name: 'pH below 6.4 for half an hour', spec: created.body.spec })
    expect((await tankRules(tankId)).find((r) => r.id === id)?.enabled).toBe(false)
    expect((await effective([tankId]))[tankId]).toEqual(defaults)

    expect((await t.api().delete(`/api/v1/rules/${id}`).set(owner)).status).toBe(204)
    expect((await tankRules(tankId)).map((r) => r.id)).toEqual(defaults)
    const gone = await t.api().patch(`/api/v1/rules/${id}`).set(owner).send({ enabled: true })
    expect([gone.status, gone.body.error.code]).toEqual([404, 'not_found'])
  })
})

describe('site-wide rules and tank overrides', () => {
  it('lists a site rule on every tank of its site, and nowhere else', async () => {
    const siteId = org.siteIds[1]
    const [a, b, elsewhere] = [await newTank(siteId), await newTank(siteId), await newTank(org.siteIds[0])]
    const created = await addSiteRule(siteId, phLow)
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ scope: 'site', siteId, tankId: null, overridesRuleId: null, name: 'pH below 6.4' })
    const id = created.body.id as number
    for (const tankId of [a, b]) {
      const listed = (await tankRules(tankId, as('viewer'))).find((r) => r.id === id)
      expect(listed).toMatchObject({ scope: 'site', overriddenHere: false })
    }
    expect((await tankRules(elsewhere)).some((r) => r.id === id)).toBe(false)
    expect((await t.api().get(`/api/v1/sites/${siteId}/rules`).set(as('keeper'))).body.map((r: PublicRule) => r.id)).toContain(id)
    expect((await t.api().get(`/api/v1/sites/${org.siteIds[0]}/rules`).set(owner)).body.map((r: PublicRule) => r.id)).not.toContain(id)
    const watched = await effective([a, b, elsewhere])
    expect([watched[a].includes(id), watched[b].includes(id), watched[elsewhere].includes(id)]).toEqual([true, true, false])
  })

  it('an override replaces the site rule on its tank only, in the listing and for the engine', async () => {
    const siteId = org.siteIds[1]
    const [a, b] = [await newTank(siteId), await newTank(siteId)]
    const siteRule = (await addSiteRule(siteId, phLow)).body as PublicRule
    const res = await override(a, siteRule.id, { spec: { kind: 'below', metric: 'ph', limit: 6.0, holdMinutes: 60 } })
    expect(res.status).toBe(200)
    expect(res.body).toEqual({
      id: expect.any(Number),
      scope: 'tank',
      siteId,
      tankId: a,
      overridesRuleId: siteRule.id,
      name: 'pH below 6.4',
      severity: 'warning',
      spec: { kind: 'below', metric: 'ph', limit: 6.0, holdMinutes: 60, clearMargin: 0 },
      enabled: true,
    })
    const own = res.body.id as number
    const onA = await tankRules(a)
    expect(onA.find((r) => r.id === siteRule.id)?.overriddenHere).toBe(true)
    expect(onA.find((r) => r.id === own)?.overridesRuleId).toBe(siteRule.id)
    expect((await tankRules(b)).find((r) => r.id === siteRule.id)?.overriddenHere).toBe(false)

    const watched = await rulesService(t.ctx).effectiveRules({ tankIds: [a, b] })
    const phRulesOf = (tankId: number) => watched.filter((e) => e.tankId === tankId && [own, siteRule.id].includes(e.rule.id))
    expect(phRulesOf(a).map((e) => [e.rule.id, e.rule.spec])).toEqual([[own, res.body.spec]])
    expect(phRulesOf(b).map((e) => e.rule.id)).toEqual([siteRule.id])

    // A second PUT changes the same override; opting out leaves the tank with neither rule.
    const optOut = await override(a, siteRule.id, { enabled: false })
    expect([optOut.body.id, optOut.body.enabled]).toEqual([own, false])
    const after = await effective([a, b])
    expect([after[a].includes(own), after[a].includes(siteRule.id), after[b].includes(siteRule.id)]).toEqual([false, false, true])
    expect((await tankRules(a)).filter((r) => r.overridesRuleId === siteRule.id)).toHaveLength(1)
  })

  it('refuses to override a tank rule or a rule of another site', async () => {
    const tankId = await newTank(org.siteIds[0])
    const tankRule = (await tankRules(tankId))[0]
    const otherSiteRule = (await addSiteRule(org.siteIds[1], phLow)).body as PublicRule
    for (const ruleId of [tankRule.id, otherSiteRule.id]) {
      const res = await override(tankId, ruleId, { enabled: false })
      expect([res.status, res.body.error.code, res.body.error.fields]).toEqual([400, 'invalid_input', { ruleId: 'not a site-wide rule of this site' }])
    }
  })
})

describe('rule validation', () => {
  it.each([
    ['an unknown kind', { kind: 'sideways', metric: 'ph', limit: 7 }, 'spec.kind'],
    ['a negative hold', { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: -5 }, 'spec.holdMinutes'],
    ['an outside band with max below min', { kind: 'outside', metric: 'ph', min: 7.5, max: 6.5 }, 'spec.max'],
    ['an unknown metric', { kind: 'above', metric: 'turbidity', limit: 35 }, 'spec.metric'],
  ])('answers 400 naming the field for %s', async (_what, spec, field) => {
    const tankId = await newTank()
    const before = (await tankRules(tankId)).length
    for (const res of [await addTankRule(tankId, { ...phLow, spec }), await addSiteRule(org.siteIds[0], { ...phLow, spec })]) {
      expect([res.status, res.body.error.code]).toEqual([400, 'invalid_input'])
      expect(Object.keys(res.body.error.fields)).toEqual([field])
    }
    const patched = await t
      .api()
      .patch(`/api/v1/rules/${(await tankRules(tankId))[0].id}`)
      .set(owner)
      .send({ spec })
    expect(Object.keys(patched.body.error.fields)).toEqual([field])
    expect((await tankRules(tankId)).length).toBe(before)
  })

  it('needs a name and a known severity', async () => {
    const res = await addTankRule(await newTank(), { ...phLow, name: '  ', severity: 'panic' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['name', 'severity'])
  })
})

describe('who may manage rules', () => {
  it('lets keepers and viewers read but only the owner write', async () => {
    const tankId = await newTank()
    const ruleId = (await tankRules(tankId))[0].id
    const siteRule = (await addSiteRule(org.siteIds[0], phLow)).body as PublicRule
    for (const role of ['keeper', 'viewer'] as const) {
      expect((await tankRules(tankId, as(role))).length).toBeGreaterThan(0)
      const attempts = [
        await addTankRule(tankId, phLow, as(role)),
        await addSiteRule(org.siteIds[0], phLow, as(role)),
        await override(tankId, siteRule.id, { enabled: false }, as(role)),
        await t.api().patch(`/api/v1/rules/${ruleId}`).set(as(role)).send({ enabled: false }),
        await t.api().delete(`/api/v1/rules/${ruleId}`).set(as(role)),
      ]
      expect(attempts.map((r) => [r.status, r.body.error.code])).toEqual(Array(5).fill([403, 'forbidden']))
    }
    expect((await tankRules(tankId)).find((r) => r.id === ruleId)?.enabled).toBe(true)
  })

  it('answers another organization’s owner 404 for every rule of this one', async () => {
    const tankId = await newTank()
    const ruleId = (await tankRules(tankId))[0].id
    const siteRule = (await addSiteRule(org.siteIds[0], phLow)).body as PublicRule
    const stranger = as('owner', other)
    const attempts = [
      await t.api().get(`/api/v1/tanks/${tankId}/rules`).set(stranger),
      await t.api().get(`/api/v1/sites/${org.siteIds[0]}/rules`).set(stranger),
      await addTankRule(tankId, phLow, stranger),
      await addSiteRule(org.siteIds[0], phLow, stranger),
      await override(tankId, siteRule.id, { enabled: false }, stranger),
      await t.api().patch(`/api/v1/rules/${ruleId}`).set(stranger).send({ enabled: false }),
      await t.api().delete(`/api/v1/rules/${ruleId}`).set(stranger),
    ]
    expect(attempts.map((r) => r.status)).toEqual(Array(7).fill(404))
    expect((await tankRules(tankId)).find((r) => r.id === ruleId)?.enabled).toBe(true)
  })
})
