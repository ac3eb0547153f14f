// Debian tools the suites drive for real: chromium for the browser tests, mosquitto_pub as an
// MQTT client that is not ours. Installed when absent.
import { existsSync } from 'node:fs'
import { aptInstall, commandExists, log } from './run.mjs'

export function ensureChromium() {
  const path = process.env.CHROMIUM_PATH || '/usr/bin/chromium'
  if (existsSync(path)) return path
  if (aptInstall(['chromium']) && existsSync('/usr/bin/chromium')) return '/usr/bin/chromium'
  log('Chromium is not available: the browser tests will fail.')
  return null
}

export function ensureMosquittoClients() {
  if (commandExists('mosquitto_pub')) return true
  const ok = aptInstall(['mosquitto-clients']) && commandExists('mosquitto_pub')
  if (!ok) log('mosquitto_pub is not available: the outside-client MQTT test will fail.')
  return ok
}
