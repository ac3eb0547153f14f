// `npm run bench:<name>`: a throwaway PostgreSQL, then bench/<name>.ts, which prints its figures.
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { ensureDependencies } from './lib/deps.mjs'
import { ensureChromium } from './lib/chromium.mjs'
import { startThrowawayCluster } from './lib/postgres.mjs'
import { log, runAsync } from './lib/run.mjs'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
process.chdir(root)
const names = process.argv.slice(2)
ensureDependencies(root)
// The suite measures the wall's bytes and time and live latency in Debian's Chromium.
const chromium = names.includes('suite') ? ensureChromium() : null
const cluster = await startThrowawayCluster()
const stop = () => cluster.destroy()
process.on('SIGINT', () => {
  stop()
  process.exit(130)
})
let failed = 0
try {
  for (const name of names) {
    const db = cluster.createDatabase(`bench_${name.replace(/\W/g, '_')}`)
    log(`— bench ${name} (PostgreSQL on 127.0.0.1:${cluster.port})`)
    // BENCH_PROFILE=<folder> writes a V8 CPU profile of the app process (open it in a Chromium devtools).
    const profile = process.env.BENCH_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_PROFILE}`] : []
    const code = await runAsync(process.execPath, [...profile, '--import', 'tsx', join(root, 'bench', `${name}.ts`)], {
      env: { ...process.env, DATABASE_URL: db, NODE_ENV: 'test', ...(chromium ? { CHROMIUM_PATH: chromium } : {}) },
    })
    if (code !== 0) failed++
  }
} finally {
  stop()
}
process.exit(failed ? 1 : 0)
