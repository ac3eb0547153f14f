import { existsSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, type TestOrg } from '../helpers/app'
import { newTank, runImport, startImportTestApp, upload, type ImportTestApp } from './import-helpers'

let t: ImportTestApp
let org: TestOrg
let tankId: number

// Models bind to one database per process, so this file runs one app, with a small limit (51 200 bytes).
beforeAll(async () => {
  t = await startImportTestApp(0.05)
  org = await t.createOrg('Marrowfen Aquatics')
  tankId = await newTank(t.ctx, org)
})
afterAll(() => t.close())

const owner = () => org.users.owner.token

describe('upload and preview', () => {
  it('detects the delimiter, the ISO time column and metrics with units from the headers', async () => {
    const csv = 'Time,Water temp (°F),pH\n2026-11-30T10:00:00+01:00,77.0,7.10\n2026-11-30T10:01:00+01:00,77.2,7.11\n'
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, csv)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.status).toBe('uploaded')
    expect(res.body.scope).toEqual({ kind: 'tank', id: tankId, timeZone: 'Europe/Berlin' })
    const p = res.body.preview
    expect(p.delimiter).toBe(',')
    expect(p.header).toEqual(['Time', 'Water temp (°F)', 'pH'])
    expect(p.rows).toEqual([
      ['2026-11-30T10:00:00+01:00', '77.0', '7.10'],
      ['2026-11-30T10:01:00+01:00', '77.2', '7.11'],
    ])
    expect(p.timeColumn).toBe('Time')
    expect(p.time.candidates).toEqual(['iso_offset'])
    expect(p.time.example).toEqual({ raw: '2026-11-30T10:00:00+01:00', parsed: '2026-11-30T09:00:00.000Z' })
    expect(p.suggested.metrics).toEqual([
      { column: 'Water temp (°F)', metric: 'temperature', unit: 'F' },
      { column: 'pH', metric: 'ph', unit: 'pH' },
    ])
  })

  it("reads a semicolon file with local times and asks for the zone, defaulting to the site's", async () => {
    const csv = 'Datum;Temperature;KH\n2026-11-30 10:00;25,5;6\n2026-11-30 10:05:30;25,6;6\n'
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, csv)
    expect(res.status).toBe(201)
    const p = res.body.preview
    expect(p.delimiter).toBe(';')
    expect(p.time.candidates).toEqual(['local_ymd'])
    expect(p.time.needsZone).toBe(true)
    // 10:00 in Berlin in November (CET, UTC+1) is 09:00 UTC.
    expect(p.time.example.parsed).toBe('2026-11-30T09:00:00.000Z')
    expect(p.suggested.timeZone).toBe('Europe/Berlin')
    expect(p.suggested.metrics).toEqual([
      { column: 'Temperature', metric: 'temperature', unit: 'C' },
      { column: 'KH', metric: 'kh', unit: 'dKH' },
    ])
  })

  it('asks day-first or month-first when no date decides it, and answers when one does', async () => {
    const ambiguous = await upload(t, owner(), `/tanks/${tankId}/imports`, 'time,temp\n03/04/2026 10:00,25\n05/06/2026 10:00,25\n')
    expect(ambiguous.body.preview.time.candidates).toEqual(['local_dmy', 'local_mdy'])
    expect(ambiguous.body.preview.time.ambiguousDayOrder).toBe(true)
    const dayFirst = await upload(t, owner(), `/tanks/${tankId}/imports`, 'time,temp\n03/04/2026 10:00,25\n13/04/2026 10:00,25\n')
    expect(dayFirst.body.preview.time.candidates).toEqual(['local_dmy'])
    expect(dayFirst.body.preview.time.ambiguousDayOrder).toBe(false)
  })

  it('recognises epoch seconds and milliseconds', async () => {
    const s = await upload(t, owner(), `/tanks/${tankId}/imports`, 'epoch,ph\n1796025600,7.2\n1796025660,7.2\n')
    expect(s.body.preview.time.candidates).toEqual(['epoch_s'])
    expect(s.body.preview.time.example.parsed).toBe(new Date(1796025600_000).toISOString())
    const ms = await upload(t, owner(), `/tanks/${tankId}/imports`, 'when,ph\n1796025600000,7.2\n')
    expect(ms.body.preview.time.candidates).toEqual(['epoch_ms'])
  })
})

describe('refused uploads store nothing', () => {
  it('answers 413 naming the limit for a file over IMPORT_MAX_MB', async () => {
    const jobsBefore = await t.ctx.models.ImportJob.count()
    const filesBefore = t.importFilesLeft()
    const big = 'time,temp\n' + '2026-11-30T10:00:00Z,25.0\n'.repeat(2400) // about 62 kB
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, big)
    expect(res.status).toBe(413)
    expect(res.body.error.code).toBe('too_large')
    expect(res.body.error.message).toBe('The file is larger than the import limit of 0.05 MB')
    expect(t.importFilesLeft()).toEqual(filesBefore)
    expect(await t.ctx.models.ImportJob.count()).toBe(jobsBefore)
  })

  it('refuses a PNG named .csv, binary data and an empty file by content', async () => {
    const before = await t.ctx.models.ImportJob.count()
    const filesBefore = t.importFilesLeft().length
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3])
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, png, 'readings.csv')
    expect(res.status).toBe(415)
    expect(res.body.error).toEqual({ code: 'not_csv', message: 'This is not a CSV file: it looks like a PNG image' })
    const nul = await upload(t, owner(), `/tanks/${tankId}/imports`, Buffer.from('time,temp\n\u0000\u0001,2\n'))
    expect(nul.status).toBe(415)
    expect(nul.body.error.message).toMatch(/binary data/)
    const latin1 = await upload(t, owner(), `/tanks/${tankId}/imports`, Buffer.from([0x74, 0x2c, 0x76, 0x0a, 0xe9, 0x2c, 0x31, 0x0a]))
    expect(latin1.status).toBe(415)
    expect(latin1.body.error.message).toMatch(/UTF-8/)
    const noFile = await t.api().post(`/api/v1/tanks/${tankId}/imports`).set(bearer(owner())).field('sourceName', 'x')
    expect(noFile.status).toBe(400)
    expect(noFile.body.error.fields).toEqual({ file: 'required' })
    expect(await t.ctx.models.ImportJob.count()).toBe(before)
    expect(t.importFilesLeft().length).toBe(filesBefore)
  })

  it('never uses a crafted file name as a path', async () => {
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, 'time,temp\n2026-11-30T10:00:00Z,25\n', '../../../etc/cron.d/evil.csv')
    expect(res.status).toBe(201)
    expect(res.body.fileName).toBe('evil.csv')
    const job = (await t.ctx.models.ImportJob.findByPk(res.body.id))!
    expect(job.fileKey).toMatch(/^[a-f0-9]{32}$/)
    expect(existsSync(join(t.dataDir, 'imports', `${job.fileKey}.csv`))).toBe(true)
    expect(t.importFilesLeft().some((f) => f.includes('evil'))).toBe(false)
  })

  it("stores nothing for another organization's tank or site", async () => {
    const other = await t.createOrg('Other Import Org')
    const filesBefore = t.importFilesLeft().length
    const res = await upload(t, other.users.owner.token, `/tanks/${tankId}/imports`, 'time,temp\n2026-11-30T10:00:00Z,25\n')
    expect(res.status).toBe(404)
    const site = await upload(t, other.users.owner.token, `/sites/${org.siteIds[0]}/imports`, 'time,temp\n2026-11-30T10:00:00Z,25\n')
    expect(site.status).toBe(404)
    expect(t.importFilesLeft().length).toBe(filesBefore)
  })
})

describe('the mapping', () => {
  it('refuses a mapping naming a column the file lacks, a local format without a zone, or a context unit', async () => {
    const res = await upload(t, owner(), `/tanks/${tankId}/imports`, 'time,temp,light\n2026-11-30 10:00,25,80\n')
    const start = (mapping: object) => t.api().post(`/api/v1/imports/${res.body.id}/start`).set(bearer(owner())).send({ mapping })
    const missing = await start({
      timeColumn: 'time',
      timeFormat: 'local_ymd',
      timeZone: 'UTC',
      metrics: [{ column: 'tmp', metric: 'temperature', unit: 'C' }],
    })
    expect(missing.status).toBe(400)
    expect(missing.body.error.fields).toEqual({ 'mapping.metrics.0.column': 'the file has no column "tmp"' })
    const noZone = await start({ timeColumn: 'time', timeFormat: 'local_ymd', metrics: [{ column: 'temp', metric: 'temperature', unit: 'C' }] })
    expect(noZone.status).toBe(400)
    expect(noZone.body.error.fields['mapping.timeZone']).toBe('a local time format needs a time zone')
    const pct = await start({ timeColumn: 'time', timeFormat: 'local_ymd', timeZone: 'UTC', metrics: [{ column: 'light', metric: 'light', unit: 'pct' }] })
    expect(pct.status).toBe(400)
    expect(pct.body.error.fields['mapping.metrics.0.unit']).toMatch(/needs the tank's context/)
    const badUnit = await start({
      timeColumn: 'time',
      timeFormat: 'local_ymd',
      timeZone: 'UTC',
      metrics: [{ column: 'temp', metric: 'temperature', unit: 'K' }],
    })
    expect(badUnit.body.error.fields['mapping.metrics.0.unit']).toBe('temperature has no unit "K"')
    expect((await t.ctx.models.ImportJob.findByPk(res.body.id))!.status).toBe('uploaded')
  })

  it('remembers the confirmed mapping per named source and offers it on the next upload', async () => {
    const csv = 'stamp,probe A,probe B\n2026-11-30 10:00,25.1,7.0\n'
    const first = await upload(t, owner(), `/tanks/${tankId}/imports`, csv, 'a.csv', 'Logger in fish room')
    expect(first.body.preview.suggestedFrom).toBe('headers')
    const mapping = {
      timeColumn: 'stamp',
      timeFormat: 'local_ymd',
      timeZone: 'America/New_York',
      metrics: [
        { column: 'probe A', metric: 'temperature', unit: 'C' },
        { column: 'probe B', metric: 'ph', unit: 'pH' },
      ],
    }
    const done = await runImport(t, owner(), first.body, mapping, 'Logger in fish room')
    expect(done.error).toBeNull()
    expect(done.status).toBe('done')
    expect(done.sourceName).toBe('Logger in fish room')

    const second = await upload(t, org.users.keeper.token, `/tanks/${tankId}/imports`, csv, 'b.csv', 'Logger in fish room')
    expect(second.body.preview.suggestedFrom).toBe('source')
    expect(second.body.preview.suggested).toEqual(mapping)
    const sources = await t.api().get('/api/v1/import-sources').set(bearer(owner()))
    expect(sources.body.maxUploadMb).toBe(0.05)
    expect(sources.body.sources.map((s: { name: string }) => s.name)).toEqual(['Logger in fish room'])
    // Another organization does not see it.
    const other = await t.createOrg('Source Privacy Org')
    const theirs = await t.api().get('/api/v1/import-sources').set(bearer(other.users.owner.token))
    expect(theirs.body.sources).toEqual([])
  })
})
