// `npm test`: a throwaway PostgreSQL, then every vitest project with the client build, the type
// checks and the house rules (lint, format, dependency rules) beside it. Ends with the ten slowest test files and one line `N passed, N failed` over
// everything it ran. Node built-ins only at the top.
import { existsSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs'
import { dirname, join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'
import { ensureDependencies } from './lib/deps.mjs'
import { startThrowawayCluster } from './lib/postgres.mjs'
import { ensureChromium, ensureMosquittoBroker, ensureMosquittoClients } from './lib/chromium.mjs'
import { log, runAsync, runCaptured } from './lib/run.mjs'

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

// A check runs beside vitest with its output kept, and is reported after vitest's own output.
async function check(name, cmd, args, env) {
  const started = Date.now()
  const { code, output } = await runCaptured(cmd, args, { env: { ...process.env, ...env } })
  return { name, ok: code === 0, code, output, seconds: (Date.now() - started) / 1000 }
}

function reportCheck({ name, ok, code, output, seconds }) {
  log(`— ${name}: ${ok ? 'ok' : `failed (exit ${code})`} in ${seconds.toFixed(0)} s`)
  if (output.trim()) process.stdout.write(output.endsWith('\n') ? output : `${output}\n`)
  if (ok) tally.passed++
  else tally.failed++
}

/** The ten test files that took longest, from vitest's JSON results (first test's start to last test's end). */
function printSlowestFiles(results) {
  const files = (results.testResults ?? []).map((f) => ({ name: relative(root, f.name), seconds: (f.endTime - f.startTime) / 1000 }))
  const slowest = files.sort((a, b) => b.seconds - a.seconds).slice(0, 10)
  if (!slowest.length) return
  log('Slowest test files:')
  for (const f of slowest) process.stdout.write(`${f.seconds.toFixed(1).padStart(8)} s  ${f.name}\n`)
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

  // The client build and the type checks run beside vitest, one after another (two cores). The
  // browser tests need the build: they wait for the file named by CLIENT_BUILD_DONE (tests/e2e/setup.ts).
  let checks = Promise.resolve([])
  if (!vitestArgs.length) {
    const buildDone = join(root, '.build', 'client-build-done.json')
    mkdirSync(dirname(buildDone), { recursive: true })
    rmSync(buildDone, { force: true })
    env.CLIENT_BUILD_DONE = buildDone
    checks = (async () => {
      const build = await check('client build (vite)', bin('vite'), ['build', '--logLevel', 'warn'])
      writeFileSync(`${buildDone}.tmp`, JSON.stringify({ ok: build.ok }))
      renameSync(`${buildDone}.tmp`, buildDone)
      const client = await check('type check: client (vue-tsc)', bin('vue-tsc'), ['--noEmit', '-p', 'tsconfig.json'])
      const server = await check('type check: server (tsc)', bin('tsc'), ['--noEmit', '-p', 'tsconfig.server.json'])
      // House rules, defined once in package.json's scripts: lint, layout, and who may import whom.
      const lint = await check('lint (eslint)', 'npm', ['run', '--silent', 'lint'])
      const format = await check('format (prettier --check)', 'npm', ['run', '--silent', 'format:check'])
      const deps = await check('dependency rules (dependency-cruiser)', 'npm', ['run', '--silent', 'deps'])
      return [build, client, server, lint, format, deps]
    })()
  }

  // Kept after the run (git-ignored) for the slowest-files table and a closer look.
  const resultsDir = join(root, '.build')
  mkdirSync(resultsDir, { recursive: true })
  const resultsFile = join(resultsDir, 'test-results.json')
  rmSync(resultsFile, { force: true })
  log(
    vitestArgs.length
      ? '— vitest'
      : '— vitest: unit, api, components, e2e, stress, stress-alone; beside it the client build, the type checks and the house rules',
  )
  const code = await runAsync(bin('vitest'), ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${resultsFile}`, ...vitestArgs], {
    env: { ...process.env, ...env },
  })
  for (const result of await checks) reportCheck(result)
  if (existsSync(resultsFile)) {
    const results = JSON.parse(readFileSync(resultsFile, 'utf8'))
    printSlowestFiles(results)
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
} catch (error) {
  tally.failed++
  log(`test run aborted: ${error instanceof Error ? error.message : error}`)
} finally {
  cleanup()
}

const skipped = tally.skipped ? `, ${tally.skipped} skipped` : ''
console.log(`\n${tally.passed} passed, ${tally.failed} failed${skipped}`)
process.exit(tally.failed > 0 ? 1 : 0)
