import { fork, type ChildProcess } from 'node:child_process'
import { compiledEntry } from '../../helpers/compiled-server'
import { freePort } from '../../helpers/ports'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'

const ROOT = fileURLToPath(new URL('../../../', import.meta.url))

/**
 * The real process entry (server/index.ts) in a child process, on fixed ports so devices can
 * reconnect to the same address after a restart. `kill()` is SIGKILL: no shutdown code runs.
 */
export async function appProcess(databaseUrl: string, env: Record<string, string> = {}) {
  const port = await freePort()
  const mqttPort = await freePort()
  const dataDir = mkdtempSync(join(tmpdir(), 'tw-faults-app-'))
  let child: ChildProcess | null = null
  let starts = 0

  async function start() {
    starts++
    const proc = fork(await compiledEntry(join(ROOT, 'server', 'index.ts')), [], {
      cwd: ROOT,
      execArgv: [],
      stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
      env: {
        ...process.env,
        NODE_ENV: 'test',
        DATABASE_URL: databaseUrl,
        HOST: '127.0.0.1',
        PORT: String(port),
        MQTT_HOST: '127.0.0.1',
        MQTT_PORT: String(mqttPort),
        FAKE_SMTP_PORT: '0',
        DATA_DIR: dataDir,
        JWT_SECRET: 'fault-suite-secret-that-is-long-enough-for-hs256',
        SERVE_CLIENT: '0',
        LOG_LEVEL: 'silent',
        BCRYPT_ROUNDS: '4',
        // As scripts/start.mjs runs the app.
        MALLOC_ARENA_MAX: '2',
        MALLOC_MMAP_THRESHOLD_: '131072',
        ...env,
      },
    })
    child = proc
    let stderr = ''
    proc.stderr?.on('data', (d) => (stderr += d))
    await new Promise<void>((resolve, reject) => {
      // Generous: a machine shared with other jobs can be slow to start a process.
      const timer = setTimeout(() => reject(new Error(`app did not start within 150 s:\n${stderr}`)), 150_000)
      proc.on('message', (m: { type?: string }) => {
        if (m?.type === 'ready') {
          clearTimeout(timer)
          resolve()
        }
      })
      proc.once('exit', (code, signal) => {
        clearTimeout(timer)
        reject(new Error(`app exited before it was ready (${code ?? signal}):\n${stderr}`))
      })
    })
  }

  function exited(proc: ChildProcess) {
    return new Promise<void>((resolve) => (proc.exitCode !== null || proc.signalCode !== null ? resolve() : proc.once('exit', () => resolve())))
  }

  return {
    port,
    mqttPort,
    baseUrl: `http://127.0.0.1:${port}`,
    mqttUrl: `mqtt://127.0.0.1:${mqttPort}`,
    start,
    get starts() {
      return starts
    },
    /** The running process's id (for its memory in /proc), or null while stopped. */
    get pid() {
      return child?.pid ?? null
    },
    /** SIGKILL: the process ends at once, mid-whatever it was doing. */
    async kill() {
      const proc = child
      if (!proc) return
      child = null
      proc.kill('SIGKILL')
      await exited(proc)
    },
    /** SIGTERM: the app's own orderly shutdown. */
    async stop() {
      const proc = child
      if (!proc) return
      child = null
      proc.kill('SIGTERM')
      await Promise.race([exited(proc), new Promise((r) => setTimeout(r, 15_000))])
      if (proc.exitCode === null && proc.signalCode === null) {
        proc.kill('SIGKILL')
        await exited(proc)
      }
    },
    cleanup() {
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}
export type AppProcess = Awaited<ReturnType<typeof appProcess>>
