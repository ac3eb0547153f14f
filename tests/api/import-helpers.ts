import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { expect } from 'vitest'
import type { AppContext } from '../../server/context'
import { importRunnerFor } from '../../server/imports/runner'
import type { PublicImportJob } from '@shared/schemas/imports'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'
import { createTankRow } from '../helpers/fixtures'

export type ImportTestApp = Awaited<ReturnType<typeof startImportTestApp>>

/** A test app with its own data folder, so a test can see exactly which files an upload left behind. */
export async function startImportTestApp(maxMb = 100) {
  // A dot folder, like the default .data: file serving must not refuse it.
  const parent = mkdtempSync(join(tmpdir(), 'tw-import-'))
  const dataDir = join(parent, '.data')
  const t = await startTestApp({ dataDir, imports: { maxMb } })
  return {
    ...t,
    dataDir,
    importFilesLeft: () => listImportFiles(dataDir),
    async close() {
      await importRunnerFor(t.ctx).idle()
      await t.close()
      rmSync(parent, { recursive: true, force: true })
    },
  }
}

export function listImportFiles(dataDir: string): string[] {
  try {
    return readdirSync(join(dataDir, 'imports'))
  } catch {
    return []
  }
}

let tankCounter = 0
export async function newTank(ctx: AppContext, org: TestOrg, options: { name?: string; siteIndex?: number } = {}) {
  tankCounter++
  const tank = await createTankRow(ctx, org, { siteId: org.siteIds[options.siteIndex ?? 0]!, name: options.name ?? `Import tank ${tankCounter}` })
  return tank.id
}

export async function upload(t: ImportTestApp, token: string, path: string, csv: string | Buffer, fileName = 'readings.csv', sourceName?: string) {
  let req = t.api().post(`/api/v1${path}`).set(bearer(token))
  if (sourceName) req = req.field('sourceName', sourceName)
  return req.attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv, 'utf8'), { filename: fileName, contentType: 'text/csv' })
}

/** Starts an uploaded file with its suggested mapping (plus overrides) and waits for the job to end. */
export async function runImport(
  t: ImportTestApp,
  token: string,
  job: PublicImportJob,
  mapping: Record<string, unknown> = {},
  sourceName?: string,
): Promise<PublicImportJob> {
  const res = await t
    .api()
    .post(`/api/v1/imports/${job.id}/start`)
    .set(bearer(token))
    .send({ mapping: { ...job.preview!.suggested, ...mapping }, ...(sourceName ? { sourceName } : {}) })
  expect(res.status, JSON.stringify(res.body)).toBe(202)
  await importRunnerFor(t.ctx).idle()
  const done = await t.api().get(`/api/v1/imports/${job.id}`).set(bearer(token))
  expect(done.status).toBe(200)
  return done.body
}

/** Minute readings ending an hour ago, ISO 8601 with an offset. */
export function minuteTimes(count: number, endMs = Date.now() - 3600_000): string[] {
  const start = Math.floor(endMs / 60_000) * 60_000 - (count - 1) * 60_000
  return Array.from({ length: count }, (_, i) => new Date(start + i * 60_000).toISOString())
}

export async function readingsOf(ctx: AppContext, tankId: number) {
  const [rows] = (await ctx.sequelize.query(`SELECT metric, time, value, source, source_key FROM readings WHERE tank_id = $1 ORDER BY time, metric`, {
    bind: [tankId],
  })) as [Array<{ metric: string; time: Date; value: number; source: string; source_key: string }>, unknown]
  return rows
}
