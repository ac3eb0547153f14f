// `npm start`: dependencies, a private PostgreSQL on 127.0.0.1, the client build, then the app
// (which migrates and seeds the demo). Ctrl-C stops everything cleanly. Node built-ins only.
import { existsSync, mkdirSync, openSync, readdirSync, statSync } from 'node:fs'
import { fork } from 'node:child_process'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { ensureDependencies } from './lib/deps.mjs'
import { startCluster } from './lib/postgres.mjs'
import { log, run } from './lib/run.mjs'
import { buildServer, serverNodeFlags } from './lib/build-server.mjs'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
process.chdir(root)
const dataDir = resolve(root, process.env.DATA_DIR ?? '.data')

function newestMtime(path) {
  if (!existsSync(path)) return 0
  const stat = statSync(path)
  if (!stat.isDirectory()) return stat.mtimeMs
  return Math.max(stat.mtimeMs, ...readdirSync(path).map((name) => newestMtime(join(path, name))))
}

function ensureClientBuild() {
  const built = newestMtime(join(root, 'dist', 'index.html'))
  const sources = Math.max(newestMtime(join(root, 'src')), newestMtime(join(root, 'shared')), newestMtime(join(root, 'index.html')))
  if (built && built > sources) return
  log('Building the client…')
  run(join(root, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'])
}

const children = []
const simulatorSpeed = process.env.SIMULATOR_SPEED ?? '20'

/** The demo shop's sensor nodes: a separate program speaking MQTT to the app's broker. */
function startSimulator(url, mqttPort) {
  mkdirSync(dataDir, { recursive: true })
  const sim = fork(
    join(root, 'simulator', 'index.ts'),
    ['--url', url, '--mqtt-url', `mqtt://127.0.0.1:${mqttPort}`, '--demo-scenarios', '--speed', simulatorSpeed],
    {
      execArgv: ['--import', 'tsx'],
      // Its tick-by-tick log would drown the app's: it goes to a file in the data folder.
      stdio: ['ignore', openSync(join(dataDir, 'simulator.log'), 'a'), 'inherit', 'ipc'],
    },
  )
  children.push(sim)
  sim.on('exit', (code) => {
    if (!stopping && code) log(`The simulator stopped (exit ${code}); the app keeps running.`)
  })
}
let cluster = null
let stopping = false

async function shutdown(code) {
  if (stopping) return
  stopping = true
  log('Stopping…')
  await Promise.all(
    children.map(
      (child) =>
        new Promise((resolve) => {
          if (child.exitCode !== null) return resolve()
          child.once('exit', resolve)
          child.kill('SIGTERM')
          setTimeout(() => child.kill('SIGKILL'), 10_000).unref()
        }),
    ),
  )
  cluster?.stop()
  log('Stopped.')
  process.exit(code)
}
process.on('SIGINT', () => void shutdown(0))
process.on('SIGTERM', () => void shutdown(0))

try {
  ensureDependencies(root)
  const env = { ...process.env, DATA_DIR: dataDir, SEED_DEMO: process.env.SEED_DEMO ?? '1', NODE_ENV: process.env.NODE_ENV ?? 'development' }
  // glibc gives each libvips (photo decoding) thread its own malloc arena, and after a large free
  // raises the size it maps separately, so freed photo buffers stay with the process. Two arenas and
  // a fixed 128 KiB threshold give memory back once an upload is done (see README, Configuration).
  env.MALLOC_ARENA_MAX ??= '2'
  env.MALLOC_MMAP_THRESHOLD_ ??= '131072'
  if (!process.env.DATABASE_URL) {
    cluster = await startCluster(join(dataDir, 'postgres'))
    env.DATABASE_URL = cluster.createDatabase('tankwarden')
    log(`PostgreSQL is up on 127.0.0.1:${cluster.port} (data in ${cluster.base})`)
  }
  ensureClientBuild()

  const serverModule = await buildServer(root)
  const app = fork(serverModule, [], {
    env,
    execArgv: serverNodeFlags(),
    stdio: ['inherit', 'inherit', 'inherit', 'ipc'],
  })
  children.push(app)
  app.on('exit', (code) => {
    if (!stopping) {
      log(`The app stopped (exit ${code}).`)
      void shutdown(code || 1)
    }
  })
  app.on('message', (message) => {
    if (message?.type !== 'ready') return
    const url = `http://127.0.0.1:${message.port}`
    if (process.env.SIMULATOR !== '0' && message.demo?.length) startSimulator(url, message.mqttPort)
    const lines = [
      '',
      `  Tankwarden is running:  ${url}`,
      '',
      ...(message.demo?.length
        ? ['  Demo sign-ins (password for all: ' + message.demo[0].password + '):', ...message.demo.map((d) => `    ${d.role.padEnd(7)} ${d.email}`)]
        : []),
      ...(message.setupCode
        ? [
            `  No business set up yet. Start here:  ${url}/setup`,
            `  (from another machine, use this host's address and the one-time setup code ${message.setupCode};`,
            '   or from a script: npm run setup -- --help)',
          ]
        : []),
      '',
      ...(message.demo?.length ? [`  Wall of the shop floor: ${url}/wall/1   Incidents: ${url}/incidents   Test mailbox: ${url}/dev/mail`] : []),
      `  MQTT broker: mqtt://127.0.0.1:${message.mqttPort}   Simulator: ${process.env.SIMULATOR === '0' ? 'off (SIMULATOR=0)' : !message.demo?.length ? 'off (no demo)' : `on, ${simulatorSpeed}× speed, demo faults`}`,
      '',
      '  Ctrl-C stops the app, the simulator and the database.',
      '',
    ]
    console.log(lines.join('\n'))
  })
} catch (error) {
  log(error instanceof Error ? error.message : String(error))
  await shutdown(1)
}
