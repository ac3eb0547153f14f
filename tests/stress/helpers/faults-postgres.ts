import { spawn } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { createSequelize } from '../../../server/platform/db/sequelize'
import { migrate } from '../../../server/platform/db/migrate'

type ThrowawayCluster = { port: number; adminUrl: string; base: string; stop: () => void; destroy: () => void }
type ClusterLib = { startThrowawayCluster: () => Promise<ThrowawayCluster>; findPgBin: () => string | null }
type RunLib = { isRoot: boolean }

// The bootstrap scripts are plain .mjs without type declarations; a URL specifier keeps tsc out of them.
const lib = <T>(file: string) => import(new URL(`../../../scripts/lib/${file}`, import.meta.url).href) as Promise<T>

function runAsServer(isRoot: boolean, command: string, args: string[]): Promise<{ code: number; output: string }> {
  const [cmd, argv] = isRoot ? ['runuser', ['-u', 'postgres', '--', command, ...args]] : [command, args]
  return new Promise((resolve) => {
    const child = spawn(cmd, argv, { stdio: ['ignore', 'pipe', 'pipe'] })
    let output = ''
    child.stdout.on('data', (d) => (output += d))
    child.stderr.on('data', (d) => (output += d))
    child.on('exit', (code) => resolve({ code: code ?? 1, output }))
  })
}

/**
 * A private PostgreSQL cluster for one fault suite, which the suite may stop and start again on
 * the same port while the app keeps running. pg_ctl runs as a child process, so the app's event
 * loop (in the same process as the test) keeps serving while the server goes down and comes back.
 */
export async function startStoppablePostgres() {
  const { startThrowawayCluster, findPgBin } = await lib<ClusterLib>('postgres.mjs')
  const { isRoot } = await lib<RunLib>('run.mjs')
  const cluster = await startThrowawayCluster()
  const pgCtl = join(findPgBin()!, 'pg_ctl')
  const dataDir = join(cluster.base, 'pgdata')
  let socketDir: string | null = null
  let running = true

  async function pgctl(args: string[]) {
    const result = await runAsServer(isRoot, pgCtl, ['-D', dataDir, ...args])
    if (result.code !== 0) throw new Error(`pg_ctl ${args.join(' ')} failed: ${result.output}`)
  }

  return {
    port: cluster.port,
    adminUrl: cluster.adminUrl,
    isRunning: () => running,
    /** A fresh, migrated database in this cluster. */
    async createMigratedDatabase(name: string) {
      const admin = createSequelize(cluster.adminUrl)
      await admin.query(`CREATE DATABASE ${name}`)
      await admin.close()
      const url = new URL(cluster.adminUrl)
      url.pathname = `/${name}`
      const sequelize = createSequelize(url.toString())
      await migrate(sequelize)
      await sequelize.close()
      return url.toString()
    },
    /** A fast shutdown: open sessions are terminated, as in a restart by an operator or a failover. */
    async stop() {
      await pgctl(['-m', 'fast', '-w', '-t', '30', 'stop'])
      running = false
    },
    /** Starts the same data folder again on the same port. */
    async start() {
      if (socketDir) rmSync(socketDir, { recursive: true, force: true })
      socketDir = mkdtempSync(join(tmpdir(), 'tw-faults-pgsock-'))
      if (isRoot) await new Promise((r) => spawn('chown', ['postgres:postgres', socketDir!]).on('exit', r))
      const options = `-p ${cluster.port} -c listen_addresses=127.0.0.1 -k ${socketDir} -c fsync=off -c synchronous_commit=off -c full_page_writes=off`
      await pgctl(['-l', join(cluster.base, 'postgres.log'), '-w', '-t', '60', '-o', options, 'start'])
      running = true
    },
    destroy() {
      cluster.destroy()
      if (socketDir) rmSync(socketDir, { recursive: true, force: true })
    },
  }
}
export type StoppablePostgres = Awaited<ReturnType<typeof startStoppablePostgres>>
