// `npm test`: a throwaway PostgreSQL, type checks, house rules (lint, format, dependency rules), the
// client build, then every vitest project.
// Ends with one line `N passed, N failed` over everything it ran. Node built-ins only at the top.
import { existsSync, readFileSync, rmSync, mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { ensureDependencies } from './lib/deps.mjs'
import { startThrowawayCluster } from './lib/postgres.mjs'
import { ensureChromium, ensureMosquittoBroker, ensureMosquittoClients } from './lib/chromium.mjs'
import { log, runAsync } from './lib/run.mjs'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
process.chdir(root)
const vitestArgs = process.argv.slice(2)

ensureDependencies(root)
const chromium = ensureChromium()
ensureMosquittoClients()
const mosquitto = ensureMosquittoBroker()

const tally = { passed: 0, failed: 0, skipped: 0 }
let cluster
let cleanedUp = false
function cleanup() {
  if (cleanedUp) return
  cleanedUp = true
  cluster?.destroy()
}
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => {
    cleanup()
    process.exit(130)
  })
}

async function check(name, cmd, args, env) {
  log(`— ${name}`)
  const code = await runAsync(cmd, args, { env: { ...process.env, ...env } })
  if (code === 0) tally.passed++
  else {
    tally.failed++
    log(`✗ ${name} failed (exit ${code})`)
  }
  return code === 0
}

try {
  cluster = await startThrowawayCluster()
  log(`Throwaway PostgreSQL on 127.0.0.1:${cluster.port}`)
  const env = {
    DATABASE_URL: cluster.adminUrl,
    NODE_ENV: 'test',
    ...(chromium ? { CHROMIUM_PATH: chromium } : {}),
    ...(mosquitto ? { MOSQUITTO_PATH: mosquitto } : {}),
  }
  const bin = (name) => join(root, 'node_modules', '.bin', name)

  if (!vitestArgs.length) {
    await check('type check: client (vue-tsc)', bin('vue-tsc'), ['--noEmit', '-p', 'tsconfig.json'])
    await check('type check: server (tsc)', bin('tsc'), ['--noEmit', '-p', 'tsconfig.server.json'])
    // House rules, defined once in package.json's scripts: lint, layout, and who may import whom.
    await check('lint (eslint)', 'npm', ['run', '--silent', 'lint'])
    await check('format (prettier --check)', 'npm', ['run', '--silent', 'format:check'])
    await check('dependency rules (dependency-cruiser)', 'npm', ['run', '--silent', 'deps'])
    await check('client build (vite)', bin('vite'), ['build', '--logLevel', 'warn'])
  }

  const resultsDir = mkdtempSync(join(tmpdir(), 'tw-vitest-'))
  const resultsFile = join(resultsDir, 'results.json')
  log('— vitest: unit, api, components, e2e, stress')
  const code = await runAsync(
    bin('vitest'),
    ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${resultsFile}`, ...vitestArgs],
    { env: { ...process.env, ...env } },
  )
  if (existsSync(resultsFile)) {
    const results = JSON.parse(readFileSync(resultsFile, 'utf8'))
    tally.passed += results.numPassedTests ?? 0
    tally.failed += results.numFailedTests ?? 0
    tally.skipped += (results.numPendingTests ?? 0) + (results.numTodoTests ?? 0)
    // A file that failed to load has no tests to count: count the file as one failure.
    const brokenFiles = (results.testResults ?? []).filter((f) => f.status === 'failed' && !(f.assertionResults ?? []).some((a) => a.status === 'failed'))
    tally.failed += brokenFiles.length
    if (code !== 0 && tally.failed === 0) tally.failed++
  } else {
    tally.failed++
    log(`vitest wrote no results (exit ${code})`)
  }
  rmSync(resultsDir, { recursive: true, force: true })
} catch (error) {
  tally.failed++
  log(`test run aborted: ${error instanceof Error ? error.message : error}`)
} finally {
  cleanup()
}

const skipped = tally.skipped ? `, ${tally.skipped} skipped` : ''
console.log(`\n${tally.passed} passed, ${tally.failed} failed${skipped}`)
process.exit(tally.failed > 0 ? 1 : 0)
