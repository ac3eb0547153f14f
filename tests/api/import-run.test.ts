import { parse } from 'csv-parse/sync'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { importRunnerFor } from '../../server/imports/runner'
import type { PublicImportJob } from '@shared/schemas/imports'
import { bearer, type TestOrg } from '../helpers/app'
import { minuteTimes, newTank, readingsOf, runImport, startImportTestApp, upload, type ImportTestApp } from './import-helpers'
import { waitFor } from '../helpers/wait'

let t: ImportTestApp
let org: TestOrg
const owner = () => org.users.owner.token

beforeAll(async () => {
  t = await startImportTestApp()
  org = await t.createOrg('Marrowfen Aquatics')
})
afterAll(() => t.close())

async function report(jobId: number) {
  const res = await t.api().get(`/api/v1/imports/${jobId}/rejections`).set(bearer(owner()))
  expect(res.status).toBe(200)
  expect(res.headers['content-type']).toMatch(/^text\/csv/)
  return parse(res.text, { columns: true }) as Array<Record<string, string>>
}

describe('a good file', () => {
  it('stores every row, converting °F to °C, and a second import of the same file stores nothing new', async () => {
    const tankId = await newTank(t.ctx, org)
    const times = minuteTimes(300)
    // 77 °F is 25 °C exactly, 68 °F is 20 °C: (F − 32) × 5/9 (ISO 80000-5:2019, degree Fahrenheit definition).
    const csv = ['Time,Temp (°F),pH', ...times.map((time, i) => `${time},${i % 2 ? 68 : 77},${(7 + i / 1000).toFixed(3)}`)].join('\n') + '\n'
    const first = await upload(t, owner(), `/tanks/${tankId}/imports`, csv)
    const job = await runImport(t, owner(), first.body)
    expect(job).toMatchObject({ status: 'done', rowsRead: 300, rowsAccepted: 300, rowsDuplicate: 0, rowsRejected: 0, hasReport: false, error: null })
    expect(job.bytesRead).toBe(job.sizeBytes)
    const stored = await readingsOf(t.ctx, tankId)
    expect(stored).toHaveLength(600)
    const temps = stored.filter((r) => r.metric === 'temperature')
    expect(temps[0]!.time.toISOString()).toBe(times[0])
    expect(temps[0]!.value).toBeCloseTo(25, 10)
    expect(temps[1]!.value).toBeCloseTo(20, 10)
    expect(stored.filter((r) => r.metric === 'ph')[299]!.value).toBeCloseTo(7.299, 10)
    expect(new Set(stored.map((r) => `${r.source} ${r.source_key}`))).toEqual(new Set([`import i:${tankId}`]))

    const again = await upload(t, org.users.keeper.token, `/tanks/${tankId}/imports`, csv, 'copy.csv')
    const second = await runImport(t, org.users.keeper.token, again.body)
    expect(second).toMatchObject({ status: 'done', rowsRead: 300, rowsAccepted: 0, rowsDuplicate: 300, rowsRejected: 0 })
    expect(await readingsOf(t.ctx, tankId)).toHaveLength(600)
    const dupes = await report(second.id)
    expect(dupes).toHaveLength(300)
    expect(dupes[0]).toMatchObject({ line: '2', reason: 'duplicate' })
    // The upload itself is removed once the job ends; the report stays.
    expect(t.importFilesLeft().filter((f) => !f.endsWith('.rejected.csv'))).toEqual([])
  })

  it('reads local times in the chosen zone and decimal commas in a semicolon file', async () => {
    const tankId = await newTank(t.ctx, org)
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, 'Zeit;Temperatur;pH\n2026-11-30 10:00;25,5;7,1\n2026-11-30 10:01:30;25,6;7,2\n')
    const job = await runImport(t, owner(), res.body, {
      timeColumn: 'Zeit',
      timeFormat: 'local_ymd',
      timeZone: 'Asia/Tokyo',
      metrics: [
        { column: 'Temperatur', metric: 'temperature', unit: 'C' },
        { column: 'pH', metric: 'ph', unit: 'pH' },
      ],
    })
    expect(job).toMatchObject({ status: 'done', rowsAccepted: 2 })
    const stored = await readingsOf(t.ctx, tankId)
    // Tokyo is UTC+9 all year (no daylight saving time), from memory.
    expect(stored.map((r) => [r.metric, r.time.toISOString(), r.value])).toEqual([
      ['ph', '2026-11-30T01:00:00.000Z', 7.1],
      ['temperature', '2026-11-30T01:00:00.000Z', 25.5],
      ['ph', '2026-11-30T01:01:30.000Z', 7.2],
      ['temperature', '2026-11-30T01:01:30.000Z', 25.6],
    ])
  })
})

describe('a file with bad rows', () => {
  it('stores the good rows and reports each bad one with its reason', async () => {
    const reef = await newTank(t.ctx, org, { name: 'Reef Display', siteIndex: 0 })
    const quarantine = await newTank(t.ctx, org, { name: 'Quarantine 2', siteIndex: 0 })
    const [t1, t2, t3, t4, t5, t6] = minuteTimes(6)
    const future = new Date(Date.now() + 86_400_000).toISOString()
    const old = new Date(Date.now() - 500 * 86_400_000).toISOString()
    const lines = [
      'time,tank,temp,ph',
      `${t1},Reef Display,25.0,8.1`, // 2 good
      `${t2},quarantine 2,26.0,7.0`, // 3 good, tank name case-insensitive
      `yesterday,Reef Display,25.0,8.1`, // 4 unparseable time
      `${t3},Reef Display,abc,8.1`, // 5 bad number
      `${t4},"=HYPERLINK(""http://x.invalid"")",25,8`, // 6 unknown tank, formula neutralised in the report
      `${t5},Reef Display,25.0,15.2`, // 7 implausible pH
      `${t1},Reef Display,25.0,8.1`, // 8 duplicate of line 2 within the file
      `${future},Reef Display,25.0,8.1`, // 9 in the future
      `${old},Reef Display,25.0,8.1`, // 10 too old
      `${t6},Reef Display,,`, // 11 no value
    ]
    const res = await upload(t, owner(), `/sites/${org.siteIds[0]}/imports`, lines.join('\r\n') + '\r\n')
    expect(res.status).toBe(201)
    expect(res.body.preview.suggested.tankColumn).toBe('tank')
    const job = await runImport(t, owner(), res.body)
    expect(job).toMatchObject({ status: 'done', rowsRead: 10, rowsAccepted: 2, rowsDuplicate: 1, rowsRejected: 7, hasReport: true })

    const rows = await report(job.id)
    expect(rows.map((r) => [r.line, r.reason, r.column])).toEqual([
      ['4', 'unparseable_time', 'time'],
      ['5', 'bad_number', 'temp'],
      ['6', 'unknown_tank', 'tank'],
      ['7', 'implausible_value', 'ph'],
      ['8', 'duplicate', ''],
      ['9', 'time_in_future', 'temp'],
      ['9', 'time_in_future', 'ph'],
      ['10', 'too_old', 'temp'],
      ['10', 'too_old', 'ph'],
      ['11', 'invalid', ''],
    ])
    expect(rows[1]!.detail).toBe('"abc" is not a number')
    expect(rows[2]!.value).toBe(`'=HYPERLINK("http://x.invalid")`)
    expect(rows[2]!.row).toBe(`${t4},=HYPERLINK("http://x.invalid"),25,8`)
    expect(rows[3]!.detail).toBe('implausible ph 15.2 pH (plausible 0 to 14)')

    // Line 7's temperature was fine and is kept; its pH is not.
    const reefRows = await readingsOf(t.ctx, reef)
    expect(reefRows.map((r) => `${r.metric}@${r.time.toISOString()}`).sort()).toEqual([`ph@${t1}`, `temperature@${t1}`, `temperature@${t5}`].sort())
    expect((await readingsOf(t.ctx, quarantine)).map((r) => r.value).sort()).toEqual([26, 7])
  })
})

describe('job control', () => {
  it('cancel stops a running job after its current batch; what was stored stays', async () => {
    const tankId = await newTank(t.ctx, org)
    const times = minuteTimes(60_000)
    const csv = 'time,temp\n' + times.map((time) => `${time},25.5`).join('\n') + '\n'
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, csv)
    const started = await t.api().post(`/api/v1/imports/${res.body.id}/start`).set(bearer(owner())).send({ mapping: res.body.preview.suggested })
    expect(started.status).toBe(202)
    const job = await waitFor(
      async () => (await t.api().get(`/api/v1/imports/${res.body.id}`).set(bearer(owner()))).body as PublicImportJob,
      (seen) => seen.rowsRead > 0,
      30_000,
      20,
    )
    expect(job.status).toBe('running')
    const cancel = await t.api().post(`/api/v1/imports/${job.id}/cancel`).set(bearer(owner()))
    expect(cancel.status).toBe(200)
    await importRunnerFor(t.ctx).idle()
    const final = (await t.api().get(`/api/v1/imports/${job.id}`).set(bearer(owner()))).body as PublicImportJob
    expect(final.status).toBe('cancelled')
    expect(final.rowsRead).toBeLessThan(60_000)
    const [{ n }] = (await t.ctx.sequelize.query('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', { bind: [tankId], plain: false }))[0] as Array<{
      n: number
    }>
    expect(n).toBe(final.rowsAccepted)
    expect(n).toBeLessThan(60_000)
    const again = await t.api().post(`/api/v1/imports/${job.id}/cancel`).set(bearer(owner()))
    expect(again.status).toBe(409)
  })

  it('a job cannot be started twice', async () => {
    const tankId = await newTank(t.ctx, org)
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, `time,temp\n${minuteTimes(1)[0]},25\n`)
    await runImport(t, owner(), res.body)
    const twice = await t.api().post(`/api/v1/imports/${res.body.id}/start`).set(bearer(owner())).send({ mapping: res.body.preview.suggested })
    expect(twice.status).toBe(409)
    expect(twice.body.error.code).toBe('import_started')
  })

  it('a job left running by a stopped instance is marked failed, never left running', async () => {
    const tankId = await newTank(t.ctx, org)
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, `time,temp\n${minuteTimes(1)[0]},25\n`)
    await t.ctx.sequelize.query(
      `UPDATE import_jobs SET status = 'running', started_at = now() - interval '5 minutes', updated_at = now() - interval '5 minutes' WHERE id = $1`,
      { bind: [res.body.id] },
    )
    const fresh = await upload(t, owner(), `/tanks/${tankId}/imports`, `time,temp\n${minuteTimes(1)[0]},25\n`)
    await t.ctx.sequelize.query(`UPDATE import_jobs SET status = 'running' WHERE id = $1`, { bind: [fresh.body.id] })
    expect(await importRunnerFor(t.ctx).markInterrupted()).toBe(1)
    const job = (await t.api().get(`/api/v1/imports/${res.body.id}`).set(bearer(owner()))).body as PublicImportJob
    expect(job.status).toBe('failed')
    expect(job.error).toMatch(/^Interrupted by a server restart/)
    expect(job.finishedAt).not.toBeNull()
    // A job whose runner touched it within the last minute is someone's live job: left alone.
    expect((await t.ctx.models.ImportJob.findByPk(fresh.body.id))!.status).toBe('running')
  })
})
