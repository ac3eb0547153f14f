import { parse } from 'csv-parse/sync'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { UNSTARTED_IMPORT_HOURS } from '@shared/schemas/imports'
import { importRunnerFor } from '../../server/imports/runner'
import { bearer, type TestOrg } from '../helpers/app'
import { minuteTimes, newTank, readingsOf, runImport, startImportTestApp, upload, type ImportTestApp } from './import-helpers'

// Malformed multipart bodies on every upload route, badly quoted CSV, and uploads never started.
// Not repeated here: upload size limits and content sniffing (import-upload, photos-upload).
let t: ImportTestApp
let org: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startImportTestApp()
  org = await t.createOrg('Brackwater Uploads')
  tankId = await newTank(t.ctx, org)
})
afterAll(() => t?.close())

const owner = () => org.users.owner.token
const BOUNDARY = 'tankwardenTestBoundary'

function multipartBody(fileName: string, content: string, field = 'file', nameParameter = `filename="${fileName}"`) {
  return Buffer.from(
    `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"; ${nameParameter}\r\nContent-Type: text/csv\r\n\r\n${content}\r\n--${BOUNDARY}--\r\n`,
    'latin1',
  )
}

const routes = () => [
  { path: `/api/v1/tanks/${tankId}/imports`, field: 'file' },
  { path: '/api/v1/backup/restore', field: 'file' },
  { path: `/api/v1/tanks/${tankId}/photos`, field: 'photo' },
]

describe('a malformed multipart body is a 400 on every upload route, and nothing is kept', () => {
  const cases: Array<[string, (field: string) => { contentType: string; body: Buffer }, string]> = [
    [
      'truncated before the closing boundary',
      (field) => {
        const whole = multipartBody('readings.csv', 'time,temp\n2026-01-01T00:00:00Z,25\n'.repeat(50), field)
        return { contentType: `multipart/form-data; boundary=${BOUNDARY}`, body: whole.subarray(0, whole.length - 200) }
      },
      'body',
    ],
    ['no boundary in the Content-Type', (field) => ({ contentType: 'multipart/form-data', body: multipartBody('readings.csv', 'time,temp\n', field) }), 'body'],
    [
      'a control character in the part header',
      (field) => ({
        contentType: `multipart/form-data; boundary=${BOUNDARY}`,
        body: multipartBody('read\u0001ings.csv', 'time,temp\n2026-01-01T00:00:00Z,25\n', field),
      }),
      'body',
    ],
    // RFC 7578 allows a percent-encoded name; decoded, it holds the control character (and would reach the database).
    [
      'a control character in an encoded file name',
      (field) => ({
        contentType: `multipart/form-data; boundary=${BOUNDARY}`,
        body: multipartBody('', 'time,temp\n2026-01-01T00:00:00Z,25\n', field, "filename*=utf-8''read%00ings%01.csv"),
      }),
      'field',
    ],
  ]
  it.each(cases)('%s', async (_what, make, named) => {
    for (const { path, field } of routes()) {
      const [jobs, files, photos] = [await t.ctx.models.ImportJob.count(), t.importFilesLeft(), await t.ctx.models.Photo.count()]
      const { contentType, body } = make(field)
      const res = await t.api().post(path).set(bearer(owner())).set('Content-Type', contentType).send(body)
      expect([path, res.status, res.body.error?.code]).toEqual([path, 400, 'invalid_input'])
      expect(Object.keys(res.body.error.fields)).toEqual([named === 'field' ? field : 'body'])
      expect([await t.ctx.models.ImportJob.count(), t.importFilesLeft(), await t.ctx.models.Photo.count()]).toEqual([jobs, files, photos])
    }
  })
})

describe('badly quoted CSV', () => {
  it('an unreadable header is a 400 naming line 1, and the file is not kept', async () => {
    const files = t.importFilesLeft()
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, '"time,temp\n2026-01-01T00:00:00Z,25\n')
    expect([res.status, res.body.error.fields]).toEqual([400, { file: 'line 1: a quoted field opened on this line is never closed' }])
    expect(t.importFilesLeft()).toEqual(files)
  })

  it('each badly quoted line is refused once, naming its line, and the lines after it are still read', async () => {
    const tank = await newTank(t.ctx, org)
    const [t0, t1, t2, t3, t4] = minuteTimes(5)
    const csv = ['time,temp', `${t0},25.0`, `${t1},"x"y`, `${t2},25.2`, `"${t3},25.3`, `${t4},25.4`].join('\n') + '\n'
    const uploaded = await upload(t, owner(), `/tanks/${tank}/imports`, csv)
    expect(uploaded.status, JSON.stringify(uploaded.body)).toBe(201)
    const done = await runImport(t, owner(), uploaded.body, { metrics: [{ column: 'temp', metric: 'temperature', unit: 'C' }] })
    expect(done).toMatchObject({ status: 'done', rowsRead: 5, rowsAccepted: 3, rowsRejected: 2 })
    expect((await readingsOf(t.ctx, tank)).map((r) => r.value)).toEqual([25.0, 25.2, 25.4])
    const report = await t.api().get(`/api/v1/imports/${uploaded.body.id}/rejections`).set(bearer(owner()))
    const rows = parse(report.text, { columns: true }) as Array<Record<string, string>>
    expect(rows.map((r) => [r.line, r.reason])).toEqual([
      ['3', 'invalid'],
      ['5', 'invalid'],
    ])
    expect(rows[0]!.detail).toMatch(/unexpected text after the closing quote/)
    expect(rows[1]!.detail).toMatch(/never closed/)
  })
})

describe('uploads never started', () => {
  it(`expire after ${UNSTARTED_IMPORT_HOURS} hours: the row and the file go; started and recent ones stay`, async () => {
    const csv = `time,temp\n${minuteTimes(1)[0]},25\n`
    const stale = (await upload(t, owner(), `/tanks/${tankId}/imports`, csv)).body
    const recent = (await upload(t, owner(), `/tanks/${tankId}/imports`, csv)).body
    const started = (await upload(t, owner(), `/tanks/${tankId}/imports`, csv)).body
    await runImport(t, owner(), started)
    const age = `now() - interval '${UNSTARTED_IMPORT_HOURS * 60 + 1} minutes'`
    await t.ctx.sequelize.query(`UPDATE import_jobs SET created_at = ${age} WHERE id IN (${stale.id}, ${started.id})`)
    const staleFile = `${(await t.ctx.models.ImportJob.findByPk(stale.id))!.fileKey}.csv`
    expect(t.importFilesLeft()).toContain(staleFile)

    expect(await importRunnerFor(t.ctx).expireUnstarted()).toBe(1)

    expect((await t.api().get(`/api/v1/imports/${stale.id}`).set(bearer(owner()))).status).toBe(404)
    expect(t.importFilesLeft()).not.toContain(staleFile)
    expect((await t.api().get(`/api/v1/imports/${recent.id}`).set(bearer(owner()))).body.status).toBe('uploaded')
    expect((await t.api().get(`/api/v1/imports/${started.id}`).set(bearer(owner()))).body.status).toBe('done')
  })
})
