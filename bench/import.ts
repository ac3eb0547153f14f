// npm run bench:import — a year of 1-minute readings for one tank as a CSV file on disk, uploaded
// over HTTP and imported by the background job end to end; then the same file again, which must
// add nothing. Prints figures; asserts nothing about time.
import { once } from 'node:events'
import { createWriteStream, openAsBlob } from 'node:fs'
import { mkdtemp, rm, stat } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import bcrypt from 'bcryptjs'
import { testConfig } from '../server/config'
import { startServer } from '../server/server'
import { authService } from '../server/people/auth'
import type { PublicImportJob } from '@shared/schemas/imports'
import { benchShop } from './fixtures'

const ROWS = Number(process.env.BENCH_IMPORT_ROWS ?? 525_600)
const dir = await mkdtemp(join(tmpdir(), 'tw-bench-import-'))
const running = await startServer(
  testConfig({
    databaseUrl: process.env.DATABASE_URL!,
    dataDir: dir,
    mqtt: { host: '127.0.0.1', port: 0 },
    logLevel: 'silent',
    mail: { fakeSmtpPort: 0, from: 'bench@tankwarden.invalid' },
    imports: { maxMb: 200 },
  }),
)
const { ctx } = running
const shop = await benchShop(ctx, 1)
const tankId = shop.devices[0]!.tankId
const user = await ctx.models.User.create({
  organizationId: shop.organizationId,
  email: 'bench-keeper@example.invalid',
  name: 'Bench keeper',
  role: 'keeper',
  passwordHash: await bcrypt.hash('bench-password-1', 4),
})
await user.reload({ include: [{ association: 'sites' }] })
const { token } = await authService(ctx).openSession(user)
const api = `http://127.0.0.1:${running.port}/api/v1`
const auth = { Authorization: `Bearer ${token}` }

// The file: one row a minute for a year, ending an hour ago; temperature in °F and pH.
const file = join(dir, 'year.csv')
const out = createWriteStream(file)
out.write('Time,Water temp (°F),pH\n')
const start = Math.floor((Date.now() - 3600_000) / 60_000) * 60_000 - (ROWS - 1) * 60_000
for (let i = 0; i < ROWS; i++) {
  const t = new Date(start + i * 60_000).toISOString()
  const line = `${t},${(77 + Math.sin(i / 720) * 1.5).toFixed(2)},${(7.2 + Math.cos(i / 1440) * 0.1).toFixed(3)}\n`
  if (!out.write(line)) await once(out, 'drain')
}
out.end()
await once(out, 'finish')
const size = (await stat(file)).size

let peakRss = process.memoryUsage().rss
const rssTimer = setInterval(() => (peakRss = Math.max(peakRss, process.memoryUsage().rss)), 200)

async function importOnce(label: string) {
  const began = performance.now()
  const form = new FormData()
  // A file-backed Blob: the bench does not read the file into memory either.
  form.append('file', await openAsBlob(file, { type: 'text/csv' }), 'year.csv')
  const uploaded = await fetch(`${api}/tanks/${tankId}/imports`, { method: 'POST', headers: auth, body: form })
  if (uploaded.status !== 201) throw new Error(`upload answered ${uploaded.status}: ${await uploaded.text()}`)
  const job = (await uploaded.json()) as PublicImportJob
  const uploadedAt = performance.now()
  const startRes = await fetch(`${api}/imports/${job.id}/start`, {
    method: 'POST',
    headers: { ...auth, 'Content-Type': 'application/json' },
    body: JSON.stringify({ mapping: job.preview!.suggested }),
  })
  if (startRes.status !== 202) throw new Error(`start answered ${startRes.status}: ${await startRes.text()}`)
  let state: PublicImportJob = job
  while (!['done', 'failed', 'cancelled'].includes(state.status)) {
    await new Promise((r) => setTimeout(r, 500))
    state = (await (await fetch(`${api}/imports/${job.id}`, { headers: auth })).json()) as PublicImportJob
  }
  const seconds = (performance.now() - began) / 1000
  return { label, state, seconds, uploadSeconds: (uploadedAt - began) / 1000 }
}

const [{ n: before }] = await ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
  bind: [tankId],
  type: 'SELECT' as never,
})
const first = await importOnce('first import')
const [{ n: afterFirst }] = await ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
  bind: [tankId],
  type: 'SELECT' as never,
})
const second = await importOnce('same file again')
const [{ n: afterSecond }] = await ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
  bind: [tankId],
  type: 'SELECT' as never,
})
clearInterval(rssTimer)

const mb = (b: number) => (b / 1024 / 1024).toFixed(0)
console.log(`\nCSV import benchmark: ${ROWS.toLocaleString('en')} rows (${mb(size)} MB, 2 metrics a row) for one tank`)
console.log('| run | status | rows read | accepted | duplicates | rejected | upload s | total s | rows/s | readings added |')
console.log('|---|---|---:|---:|---:|---:|---:|---:|---:|---:|')
for (const [run, added] of [
  [first, afterFirst - before],
  [second, afterSecond - afterFirst],
] as const) {
  const s = run.state
  console.log(
    `| ${run.label} | ${s.status}${s.error ? ` (${s.error})` : ''} | ${s.rowsRead} | ${s.rowsAccepted} | ${s.rowsDuplicate} | ${s.rowsRejected} | ${run.uploadSeconds.toFixed(1)} | ${run.seconds.toFixed(1)} | ${Math.round(s.rowsRead / run.seconds)} | ${added} |`,
  )
}
console.log(`server process peak RSS: ${mb(peakRss)} MB (server and bench client share this process)`)
console.log(`second import added ${afterSecond - afterFirst} readings (must be 0)`)

await running.stop()
await rm(dir, { recursive: true, force: true })
