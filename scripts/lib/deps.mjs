// Installs node_modules when they are missing or older than the lock file.
import { existsSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { log, run } from './run.mjs'

export function ensureDependencies(root) {
  const lock = join(root, 'package-lock.json')
  const installed = join(root, 'node_modules', '.package-lock.json')
  const stale = !existsSync(installed) || (existsSync(lock) && statSync(lock).mtimeMs > statSync(installed).mtimeMs + 1000)
  if (!stale) return
  log('Installing dependencies (npm ci)…')
  const args = existsSync(lock) ? ['ci', '--no-audit', '--no-fund'] : ['install', '--no-audit', '--no-fund']
  run('npm', args, { cwd: root })
}
