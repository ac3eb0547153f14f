// A private PostgreSQL cluster from Debian's server binaries, bound to 127.0.0.1.
// initdb and postgres refuse to run as root, so as root every server command runs as the
// `postgres` system user, on a data folder that user owns. Node built-ins only.
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync, chmodSync, rmSync, mkdtempSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { randomBytes } from 'node:crypto'
import { aptInstall, isRoot, log, run } from './run.mjs'

const PG_ROOT = '/usr/lib/postgresql'

export function findPgBin() {
  if (!existsSync(PG_ROOT)) return null
  const versions = readdirSync(PG_ROOT)
    .filter((v) => existsSync(join(PG_ROOT, v, 'bin', 'initdb')) && existsSync(join(PG_ROOT, v, 'bin', 'postgres')))
    .sort((a, b) => Number(b) - Number(a))
  return versions.length ? join(PG_ROOT, versions[0], 'bin') : null
}

/** The server binaries, installing Debian's `postgresql` package when they are absent. */
export function ensurePgBin() {
  let bin = findPgBin()
  if (bin) return bin
  log('PostgreSQL server binaries not found.')
  if (!aptInstall(['postgresql'])) {
    throw new Error('PostgreSQL is required: install Debian\'s "postgresql" package, or set DATABASE_URL to a server of yours.')
  }
  bin = findPgBin()
  if (!bin) throw new Error(`postgresql installed, but no server binaries under ${PG_ROOT}`)
  return bin
}

function asServerUser(cmd, args) {
  return isRoot ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args]
}

function serverRun(bin, tool, args, options = {}) {
  const [cmd, argv] = asServerUser(join(bin, tool), args)
  return run(cmd, argv, { quiet: true, ...options })
}

function ensureServerUser() {
  if (!isRoot) return
  if (run('id', ['-u', 'postgres'], { quiet: true, allowFail: true }).status === 0) return
  run('useradd', ['--system', '--home-dir', '/var/lib/postgresql', '--shell', '/bin/sh', 'postgres'], { quiet: true })
}

/** Can the server user reach and write this folder? (A clone under /root is not reachable.) */
function serverUserCanUse(dir) {
  if (!isRoot) return true
  mkdirSync(dir, { recursive: true })
  run('chown', ['postgres:postgres', dir], { quiet: true })
  return run('runuser', ['-u', 'postgres', '--', 'test', '-w', dir, '-a', '-x', dir], { quiet: true, allowFail: true }).status === 0
}

export function freePort(preferred = 0) {
  return new Promise((resolve) => {
    const server = createServer()
    server.once('error', () => (preferred ? freePort(0).then(resolve) : resolve(0)))
    server.listen(preferred, '127.0.0.1', () => {
      const { port } = server.address()
      server.close(() => resolve(port))
    })
  })
}

/**
 * Starts (creating when new) a cluster under `baseDir`. Options:
 *  - throwaway: no fsync, trust authentication (test clusters);
 *  - port: preferred port (a free one is chosen on a clash).
 * Returns { url, port, stop }.
 */
export async function startCluster(baseDir, { throwaway = false, port: preferredPort = 0 } = {}) {
  const bin = ensurePgBin()
  ensureServerUser()
  let base = baseDir
  if (!serverUserCanUse(base)) {
    // The project folder is not reachable by the `postgres` user (e.g. a clone under /root).
    const fallback = join('/var/tmp', `tankwarden-${Buffer.from(baseDir).toString('hex').slice(-24)}`)
    log(`${baseDir} is not reachable by the postgres user; keeping the database in ${fallback}`)
    base = fallback
    serverUserCanUse(base)
  }
  const dataDir = join(base, 'pgdata')
  const passwordFile = join(base, 'password')
  const portFile = join(base, 'port')

  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    log(`Creating a PostgreSQL cluster in ${dataDir}…`)
    mkdirSync(dataDir, { recursive: true })
    if (isRoot) run('chown', ['postgres:postgres', dataDir], { quiet: true })
    const args = ['-D', dataDir, '-U', 'postgres', '-E', 'UTF8', '--locale=C']
    if (throwaway) {
      args.push('-A', 'trust', '--no-sync')
    } else {
      const password = randomBytes(18).toString('base64url')
      writeFileSync(passwordFile, password, { mode: 0o600 })
      const pwfile = join(base, 'pwfile.tmp')
      writeFileSync(pwfile, password, { mode: 0o600 })
      if (isRoot) run('chown', ['postgres:postgres', pwfile], { quiet: true })
      args.push('--auth-local=trust', '--auth-host=scram-sha-256', `--pwfile=${pwfile}`)
      try {
        serverRun(bin, 'initdb', args)
      } finally {
        rmSync(pwfile, { force: true })
      }
    }
    if (throwaway) serverRun(bin, 'initdb', args)
  }

  const socketDir = mkdtempSync(join(tmpdir(), 'tw-pgsock-'))
  if (isRoot) run('chown', ['postgres:postgres', socketDir], { quiet: true })
  const remembered = existsSync(portFile) ? Number(readFileSync(portFile, 'utf8')) : 0
  const options = [`-c listen_addresses=127.0.0.1`, `-k ${socketDir}`]
  if (throwaway) options.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off')

  let port = 0
  for (let attempt = 0; attempt < 5; attempt++) {
    port = await freePort(attempt === 0 ? preferredPort || remembered : 0)
    const result = serverRun(
      bin,
      'pg_ctl',
      ['-D', dataDir, '-l', join(base, 'postgres.log'), '-w', '-t', '60', '-o', `-p ${port} ${options.join(' ')}`, 'start'],
      { allowFail: true },
    )
    if (result.status === 0) break
    const alreadyRunning = serverRun(bin, 'pg_ctl', ['-D', dataDir, 'status'], { allowFail: true }).status === 0
    if (alreadyRunning) {
      log('A PostgreSQL server from an earlier run was still running on this data folder; restarting it.')
      serverRun(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { allowFail: true })
    }
    if (attempt === 4) {
      const logTail = existsSync(join(base, 'postgres.log')) ? readFileSync(join(base, 'postgres.log'), 'utf8').slice(-2000) : ''
      throw new Error(`PostgreSQL did not start:\n${result.stderr ?? ''}\n${logTail}`)
    }
  }
  if (!throwaway) writeFileSync(portFile, String(port))

  const password = existsSync(passwordFile) ? readFileSync(passwordFile, 'utf8').trim() : ''
  const auth = password ? `postgres:${encodeURIComponent(password)}` : 'postgres'
  const adminUrl = `postgres://${auth}@127.0.0.1:${port}/postgres`
  let stopped = false
  const stop = () => {
    if (stopped) return
    stopped = true
    serverRun(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', '-t', '30', 'stop'], { allowFail: true })
    rmSync(socketDir, { recursive: true, force: true })
  }
  const createDatabase = (name) => {
    const psql = join(bin, 'psql')
    const env = { ...process.env, PGPASSWORD: password }
    const common = ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '-d', 'postgres', '-tA', '-v', 'ON_ERROR_STOP=1']
    const exists = run(psql, [...common, '-c', `SELECT 1 FROM pg_database WHERE datname = '${name}'`], { quiet: true, env })
    if (exists.stdout.trim() !== '1') run(psql, [...common, '-c', `CREATE DATABASE "${name}"`], { quiet: true, env })
    return `postgres://${auth}@127.0.0.1:${port}/${name}`
  }
  return { port, adminUrl, base, stop, createDatabase }
}

/** A throwaway cluster in a fresh temporary folder, removed by `destroy`. */
export async function startThrowawayCluster() {
  const base = mkdtempSync(join(tmpdir(), 'tw-pgtest-'))
  if (isRoot) {
    chmodSync(base, 0o755)
  }
  const cluster = await startCluster(base, { throwaway: true })
  return {
    ...cluster,
    destroy() {
      cluster.stop()
      rmSync(base, { recursive: true, force: true })
    },
  }
}
