// Debian tools the suites drive for real: chromium for the browser tests, mosquitto_pub as an
// MQTT client that is not ours, the mosquitto broker for the several-instances and fault suites.
// Installed when absent.
import { existsSync } from 'node:fs'
import { aptInstall, commandExists, log } from './run.mjs'

/**
 * Flags for every headless Chromium the project starts (tests, smoke, bench): no sandbox (root in
 * CI), no GPU, and none of the background connections this closed network refuses.
 */
export const CHROMIUM_FLAGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-dev-shm-usage',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
]

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

/** The mosquitto broker binary (Debian installs it in /usr/sbin), or null. */
export function ensureMosquittoBroker() {
  const path = process.env.MOSQUITTO_PATH || '/usr/sbin/mosquitto'
  if (existsSync(path)) return path
  if (aptInstall(['mosquitto']) && existsSync('/usr/sbin/mosquitto')) return '/usr/sbin/mosquitto'
  log('The mosquitto broker is not available: the external-broker suites will fail.')
  return null
}
