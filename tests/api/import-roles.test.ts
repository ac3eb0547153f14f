import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { importRunnerFor } from '../../server/imports/runner'
import { bearer, type TestOrg } from '../helpers/app'
import { minuteTimes, newTank, startImportTestApp, upload, type ImportTestApp } from './import-helpers'
import { CALLERS, tokenOf } from '../helpers/role-table'

// Who may import: owners and keepers; a viewer gets 403, another organization 404 (its rows are
// not ours to reveal), no token 401. The same routes are listed in route-roles.test.ts.
let t: ImportTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startImportTestApp()
  org = await t.createOrg('Import Roles Org')
  other = await t.createOrg('Other Import Roles Org')
})
afterAll(() => t.close())

const csv = () => `time,temp\n${minuteTimes(1)[0]},25\n`

async function uploadedJob() {
  const tankId = await newTank(t.ctx, org)
  const res = await upload(t, org.users.owner.token, `/tanks/${tankId}/imports`, csv())
  expect(res.status).toBe(201)
  return res.body as { id: number; preview: { suggested: object } }
}
async function finishedJobWithReport() {
  const job = await uploadedJob()
  await t.ctx.models.ImportJob.update({ status: 'done', hasReport: true }, { where: { id: job.id } })
  return job
}

type Case = {
  method: 'get' | 'post'
  route: string
  expected: [number, number, number, number]
  send: (token: string | null) => Promise<{ status: number; body: unknown }>
}
const withToken = <R extends { set: (h: Record<string, string>) => R }>(req: R, token: string | null) => (token ? req.set(bearer(token)) : req)

const CASES: Case[] = [
  {
    method: 'post',
    route: '/tanks/:id/imports',
    expected: [201, 201, 403, 404],
    send: async (token) => {
      const tankId = await newTank(t.ctx, org)
      return withToken(t.api().post(`/api/v1/tanks/${tankId}/imports`), token).attach('file', Buffer.from(csv()), 'r.csv')
    },
  },
  {
    method: 'post',
    route: '/sites/:id/imports',
    expected: [201, 201, 403, 404],
    send: (token) => withToken(t.api().post(`/api/v1/sites/${org.siteIds[0]}/imports`), token).attach('file', Buffer.from(csv()), 'r.csv'),
  },
  {
    method: 'get',
    route: '/imports/:id',
    expected: [200, 200, 403, 404],
    send: async (token) => withToken(t.api().get(`/api/v1/imports/${(await uploadedJob()).id}`), token),
  },
  {
    method: 'post',
    route: '/imports/:id/start',
    expected: [202, 202, 403, 404],
    send: async (token) => {
      const job = await uploadedJob()
      return withToken(t.api().post(`/api/v1/imports/${job.id}/start`), token).send({ mapping: job.preview.suggested })
    },
  },
  {
    method: 'post',
    route: '/imports/:id/cancel',
    expected: [200, 200, 403, 404],
    send: async (token) => withToken(t.api().post(`/api/v1/imports/${(await uploadedJob()).id}/cancel`), token),
  },
  {
    method: 'get',
    route: '/imports/:id/rejections',
    expected: [200, 200, 403, 404],
    send: async (token) => {
      const job = await finishedJobWithReport()
      const file = await import('node:fs/promises')
      const row = (await t.ctx.models.ImportJob.findByPk(job.id))!
      await file.writeFile(`${t.dataDir}/imports/${row.fileKey}.rejected.csv`, 'line,reason\n2,bad_number\n')
      return withToken(t.api().get(`/api/v1/imports/${job.id}/rejections`), token)
    },
  },
  { method: 'get', route: '/import-sources', expected: [200, 200, 403, 200], send: (token) => withToken(t.api().get('/api/v1/import-sources'), token) },
]

const cases = CASES.flatMap((c) => CALLERS.map((caller, i) => ({ ...c, caller, status: caller === 'noToken' ? 401 : c.expected[i]! })))

describe('import route roles', () => {
  it.each(cases)('$method $route as $caller → $status', async ({ caller, status, send }) => {
    const res = await send(tokenOf(caller, org, other))
    expect(res.status, JSON.stringify(res.body)).toBe(status)
    await importRunnerFor(t.ctx).idle()
  })

  it("a viewer's refused upload leaves no file behind", async () => {
    const before = t.importFilesLeft().length
    const tankId = await newTank(t.ctx, org)
    const res = await upload(t, org.users.viewer.token, `/tanks/${tankId}/imports`, csv())
    expect(res.status).toBe(403)
    expect(t.importFilesLeft().length).toBe(before)
  })
})
