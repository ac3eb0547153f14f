// Process helpers for the bootstrap scripts. Node built-ins only: these run before `npm ci`.
import { spawn, spawnSync } from 'node:child_process'

export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0

export function log(message) {
  process.stdout.write(`[tankwarden] ${message}\n`)
}

/** Runs a command to completion, inheriting stdio unless `quiet`; throws on a non-zero exit. */
export function run(cmd, args, options = {}) {
  const { quiet = false, env, cwd, allowFail = false } = options
  const result = spawnSync(cmd, args, {
    stdio: quiet ? 'pipe' : 'inherit',
    env: env ?? process.env,
    cwd,
    encoding: 'utf8',
  })
  if (result.error) {
    if (allowFail) return result
    throw new Error(`${cmd} could not start: ${result.error.message}`)
  }
  if (result.status !== 0 && !allowFail) {
    const detail = quiet ? `\n${result.stdout ?? ''}${result.stderr ?? ''}` : ''
    throw new Error(`${cmd} ${args.join(' ')} exited with ${result.status}${detail}`)
  }
  return result
}

/** Runs a command and resolves with its exit code (stdio inherited). */
export function runAsync(cmd, args, options = {}) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { stdio: 'inherit', env: options.env ?? process.env, cwd: options.cwd })
    child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)))
    child.on('error', () => resolve(127))
  })
}

/** Runs a command with its output kept rather than shown; resolves with the exit code and the output. */
export function runCaptured(cmd, args, options = {}) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { stdio: ['ignore', 'pipe', 'pipe'], env: options.env ?? process.env, cwd: options.cwd })
    let output = ''
    child.stdout.on('data', (d) => (output += d))
    child.stderr.on('data', (d) => (output += d))
    child.on('close', (code, signal) => resolve({ code: code ?? (signal ? 1 : 0), output }))
    child.on('error', (error) => resolve({ code: 127, output: error.message }))
  })
}

export function commandExists(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0
}

/** Installs Debian packages when running as root; returns false with a message otherwise. */
export function aptInstall(packages) {
  if (!isRoot) {
    log(`Please install these Debian packages (as root): apt-get install -y ${packages.join(' ')}`)
    return false
  }
  log(`Installing ${packages.join(', ')} from Debian's packages…`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  const first = run('apt-get', ['install', '-y', '--no-install-recommends', ...packages], { env, allowFail: true, quiet: true })
  if (first.status === 0) return true
  run('apt-get', ['update'], { env, allowFail: true, quiet: true })
  const second = run('apt-get', ['install', '-y', '--no-install-recommends', ...packages], { env, allowFail: true, quiet: true })
  if (second.status !== 0) log(`apt-get could not install ${packages.join(' ')}:\n${second.stderr ?? ''}`)
  return second.status === 0
}
