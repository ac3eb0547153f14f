// Debian's chromium for the browser tests, installed when absent.
import { existsSync } from 'node:fs'
import { aptInstall, log } from './run.mjs'

export function ensureChromium() {
  const path = process.env.CHROMIUM_PATH || '/usr/bin/chromium'
  if (existsSync(path)) return path
  if (aptInstall(['chromium']) && existsSync('/usr/bin/chromium')) return '/usr/bin/chromium'
  log('Chromium is not available: the browser tests will fail.')
  return null
}
