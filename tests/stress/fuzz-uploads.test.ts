// Property-based fuzzing of the upload routes: malformed multipart bodies on every multipart route,
// and malformed CSV through upload, preview and the import job. Not repeated here: size limits and
// content sniffing (tests/api/import-upload, photos-upload) and JSON bodies (fuzz-api-*).
import fc from 'fast-check'
import { parse } from 'csv-parse/sync'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { importRunnerFor } from '../../server/imports/runner'
import { minuteTimes, newTank, startImportTestApp, type ImportTestApp } from '../api/import-helpers'
import { bearer, type TestOrg } from '../helpers/app'
import { hostileCsv, hostileMultipart, multipart, type FuzzUpload } from '../helpers/fuzz-uploads'

const NUM_RUNS = Number(process.env.FUZZ_RUNS ?? 100)
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined
const ANSWERS = [201, 400, 404, 409, 413, 415]

let t: ImportTestApp
let org: TestOrg
let tankId: number
const unexpected: unknown[] = []
const onUnexpected = (error: unknown) => unexpected.push(error)

beforeAll(async () => {
  process.on('unhandledRejection', onUnexpected)
  process.on('uncaughtException', onUnexpected)
  t = await startImportTestApp()
  org = await t.createOrg('Reedbank Fuzz Uploads')
  tankId = await newTank(t.ctx, org)
})
afterAll(async () => {
  process.off('unhandledRejection', onUnexpected)
  process.off('uncaughtException', onUnexpected)
  await t?.close()
})

const owner = () => bearer(org.users.owner.token)
const kept = async () => JSON.stringify([await t.ctx.models.ImportJob.count(), await t.ctx.models.Photo.count(), t.importFilesLeft()])

/** What is wrong with one answer to an upload, or null. */
function judge(status: number, body: { error?: { code?: string; message?: string; fields?: object } }): string | null {
  if (!ANSWERS.includes(status)) return `status ${status}`
  if (status < 400) return null
  if (!body.error?.code || !body.error.message) return 'no error shape'
  if (status === 400 && !Object.keys(body.error.fields ?? {}).length) return 'a 400 without fields'
  return null
}

describe('malformed multipart bodies', () => {
  it('every upload route answers 400 (or 413/415), never a 500, and keeps nothing it refused', { timeout: 600_000 }, async () => {
    const csv = Buffer.from(
      `time,temperature\n${minuteTimes(3)
        .map((time) => `${time},25.0`)
        .join('\n')}\n`,
    )
    const routes = [
      { path: `/api/v1/tanks/${tankId}/imports`, field: 'file' },
      { path: '/api/v1/backup/restore', field: 'file' },
      { path: `/api/v1/tanks/${tankId}/photos`, field: 'photo' },
    ]
    const failures: string[] = []
    let cases = 0
    for (const route of routes) {
      const statuses: Record<number, number> = {}
      await fc.assert(
        fc.asyncProperty(hostileMultipart(route.field, csv), async (sent: FuzzUpload) => {
          cases++
          const before = await kept()
          const res = await t.api().post(route.path).set(owner()).set('Content-Type', sent.contentType).send(sent.body)
          statuses[res.status] = (statuses[res.status] ?? 0) + 1
          let problem = judge(res.status, res.body)
          if (!problem && res.status >= 400 && (await kept()) !== before) problem = `refused with ${res.status} but kept a row or file`
          if (problem) failures.push(`${route.path} [${sent.how}] → ${res.status} ${JSON.stringify(res.body).slice(0, 200)}: ${problem}`)
          // An accepted import upload is cancelled, so the next case starts from the same tables.
          if (res.status === 201 && res.body.status === 'uploaded') await t.api().post(`/api/v1/imports/${res.body.id}/cancel`).set(owner())
        }),
        { numRuns: NUM_RUNS, seed: SEED },
      )
      console.log(
        `fuzz multipart ${route.path}: ${Object.entries(statuses)
          .map(([s, n]) => `${s}×${n}`)
          .join(' ')}`,
      )
    }
    console.log(`fuzz uploads multipart: ${routes.length} routes, ${cases} cases, ${failures.length} failures, ${unexpected.length} unhandled errors`)
    expect(failures.slice(0, 10)).toEqual([])
    expect(unexpected).toEqual([])
  })
})

describe('malformed CSV', () => {
  it('uploads answer 201 or a clear 4xx; every started job ends done, counting each line once', { timeout: 600_000 }, async () => {
    const failures: string[] = []
    let cases = 0
    const times = minuteTimes(12)
    await fc.assert(
      fc.asyncProperty(hostileCsv(times), async ({ text, how }) => {
        cases++
        const before = await kept()
        const res = await t.api().post(`/api/v1/tanks/${tankId}/imports`).set(owner()).attach('file', text, { filename: 'fuzz.csv', contentType: 'text/csv' })
        const problem = judge(res.status, res.body) ?? (res.status >= 400 && (await kept()) !== before ? 'refused but kept a row or file' : null)
        if (problem) return void failures.push(`upload [${how}] → ${res.status} ${JSON.stringify(res.body).slice(0, 200)}: ${problem}`)
        if (res.status !== 201) return
        const header: string[] = res.body.preview.header
        const mapping = { timeColumn: header[0], timeFormat: 'iso_offset', metrics: [{ column: header[1] ?? header[0], metric: 'temperature', unit: 'C' }] }
        const started = await t.api().post(`/api/v1/imports/${res.body.id}/start`).set(owner()).send({ mapping })
        if (started.status !== 202) {
          const refusal = judge(started.status, started.body)
          if (refusal) failures.push(`start [${how}] → ${started.status}: ${refusal}`)
          await t.api().post(`/api/v1/imports/${res.body.id}/cancel`).set(owner())
          return
        }
        await importRunnerFor(t.ctx).idle()
        const job = (await t.api().get(`/api/v1/imports/${res.body.id}`).set(owner())).body
        if (job.status !== 'done') return void failures.push(`job [${how}] ended ${job.status}: ${job.error}`)
        if (job.rowsRead !== job.rowsAccepted + job.rowsDuplicate + job.rowsRejected) failures.push(`job [${how}] counts ${JSON.stringify(job)}`)
        if (job.hasReport) {
          const report = parse((await t.api().get(`/api/v1/imports/${res.body.id}/rejections`).set(owner())).text, { columns: true }) as Array<{
            line: string
            reason: string
          }>
          const refusedLines = report.filter((r) => r.reason !== 'duplicate').map((r) => r.line)
          if (new Set(refusedLines).size > job.rowsRejected)
            failures.push(`job [${how}] reported ${new Set(refusedLines).size} refused lines for ${job.rowsRejected} refused rows`)
        }
      }),
      { numRuns: NUM_RUNS, seed: SEED },
    )
    console.log(`fuzz uploads csv: 1 route, ${cases} cases, ${failures.length} failures, ${unexpected.length} unhandled errors`)
    expect(failures.slice(0, 10)).toEqual([])
    expect(unexpected).toEqual([])
    expect((await t.api().get('/api/v1/health')).status).toBe(200)
  })

  it('a well-formed body still uploads (the fuzz base is valid)', async () => {
    const csv = Buffer.from(
      `time,temperature\n${minuteTimes(2)
        .map((time) => `${time},25.0`)
        .join('\n')}\n`,
    )
    const res = await t
      .api()
      .post(`/api/v1/tanks/${tankId}/imports`)
      .set(owner())
      .set('Content-Type', 'multipart/form-data; boundary=fuzzBoundary7MA4YWxkTrZu0gW')
      .send(multipart('file', 'ok.csv', csv))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
  })
})
