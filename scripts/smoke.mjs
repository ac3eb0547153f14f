// `npm run smoke`, and the first step of CI: a newcomer's first run. `npm start` on this checkout
// (installing packages when node_modules is missing) with a fresh data folder; wait for the address
// it prints; Chromium opens it, signs in as the demo owner through the form and sees the tanks with
// their states; then Ctrl-C (SIGINT to the whole process group, as a terminal sends it) and check
// that the app, the simulator and PostgreSQL are gone and their ports free.
// Node built-ins only at the top: playwright-core is imported once `npm start` has installed it.
import { spawn } from 'node:child_process'
import { chmodSync, createWriteStream, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { CHROMIUM_FLAGS, ensureChromium } from './lib/chromium.mjs'
import { freePort } from './lib/postgres.mjs'
import { log } from './lib/run.mjs'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
process.chdir(root)
const READY_TIMEOUT_MS = Number(process.env.SMOKE_READY_SECONDS ?? 900) * 1000
const STOP_TIMEOUT_MS = 30_000
const started = Date.now()
const seconds = () => `${((Date.now() - started) / 1000).toFixed(0)} s`

/** What `npm start` printed so far (both streams), and a promise for the first match of a pattern. */
function watchOutput(streams, sink) {
  let text = ''
  const waiters = []
  for (const stream of streams)
    stream.setEncoding('utf8').on('data', (chunk) => {
      text += chunk
      sink.write(chunk)
      for (const w of [...waiters]) {
        const match = text.match(w.pattern)
        if (match) {
          waiters.splice(waiters.indexOf(w), 1)
          w.resolve(match)
        }
      }
    })
  return {
    text: () => text,
    waitFor(pattern, ms, what) {
      const match = text.match(pattern)
      if (match) return Promise.resolve(match)
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`no ${what} within ${ms / 1000} s`)), ms)
        waiters.push({ pattern, resolve: (m) => (clearTimeout(timer), resolve(m)) })
      })
    },
  }
}

/** Processes whose command line mentions any of `needles` (the app, the simulator, PostgreSQL of this run). */
function processesMentioning(needles) {
  const found = []
  for (const pid of readdirSync('/proc').filter((name) => /^\d+$/.test(name))) {
    let cmdline = ''
    try {
      cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8').replaceAll('\0', ' ').trim()
    } catch {
      continue
    }
    if (Number(pid) !== process.pid && needles.some((n) => cmdline.includes(n))) found.push(`${pid}: ${cmdline}`)
  }
  return found
}

function portIsFree(port) {
  return new Promise((resolve) => {
    const server = createServer()
    server.once('error', () => resolve(false))
    server.listen(port, '127.0.0.1', () => server.close(() => resolve(true)))
  })
}

async function checkInBrowser(url, owner, password, shotsDir) {
  const chromiumPath = ensureChromium()
  if (!chromiumPath) throw new Error('Chromium is not available')
  const { chromium } = await import('playwright-core')
  const browser = await chromium.launch({
    executablePath: chromiumPath,
    headless: true,
    args: CHROMIUM_FLAGS,
  })
  const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
  try {
    const response = await page.goto(url, { timeout: 30_000 })
    if (response?.status() !== 200) throw new Error(`${url} answered ${response?.status()}`)
    await page.waitForURL(/\/sign-in/, { timeout: 30_000 })
    log(`${url} opened the sign-in page (${seconds()})`)
    await page.getByLabel('E-mail').fill(owner, { timeout: 30_000 })
    await page.getByLabel('Password', { exact: true }).fill(password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    // The owner lands on the overview; the tanks list is one step on.
    await page.waitForURL((u) => u.pathname === '/', { timeout: 30_000 })
    await page.goto(`${url}/tanks`, { timeout: 30_000 })
    // Every tank row shows its state word; the simulator's readings make some more than "quiet".
    const rows = page.locator('[data-test="tank-row"]')
    await rows.first().waitFor({ timeout: 30_000 })
    const states = page.locator('[data-test="tanks-table"] [data-test="tank-state"]')
    await page.waitForFunction(
      // eslint-disable-next-line no-undef -- this function runs in the page, where document exists
      () => [...document.querySelectorAll('[data-test="tanks-table"] [data-test="tank-state"]')].some((el) => /Steady|Watch|Alarm/.test(el.textContent ?? '')),
      undefined,
      { timeout: 60_000 },
    )
    const words = (await states.allTextContents()).map((t) => t.trim())
    const count = await rows.count()
    if (words.length !== count || words.some((w) => !/^(Steady|Watch|Alarm|Quiet|No sensor)\b/.test(w))) {
      throw new Error(`each of the ${count} tank rows should show its state; saw: ${words.join(', ')}`)
    }
    log(`Signed in as ${owner}: ${count} tanks, states ${[...new Set(words)].join(' / ')} (${seconds()})`)
    await page.screenshot({ path: join(shotsDir, 'smoke-tanks.png') })
  } catch (error) {
    await page.screenshot({ path: join(shotsDir, 'smoke-failed.png') }).catch(() => undefined)
    throw error
  } finally {
    await browser.close()
  }
}

const dataDir = mkdtempSync(join(root, '.data-smoke-'))
// As root, PostgreSQL runs as the `postgres` user, who must reach its folder inside this one.
chmodSync(dataDir, 0o755)
const logFile = join(dataDir, 'start.log')
const sink = createWriteStream(logFile)
const [port, mqttPort, smtpPort] = [await freePort(), await freePort(), await freePort()]
log(`Smoke: npm start with data folder ${dataDir}${existsSync(join(root, 'node_modules')) ? '' : ' and no node_modules'}`)

const start = spawn('npm', ['start'], {
  cwd: root,
  detached: true, // its own process group, which the SIGINT below reaches as a terminal's Ctrl-C would
  stdio: ['ignore', 'pipe', 'pipe'],
  env: { ...process.env, DATA_DIR: dataDir, PORT: String(port), MQTT_PORT: String(mqttPort), FAKE_SMTP_PORT: String(smtpPort), DATABASE_URL: '' },
})
const out = watchOutput([start.stdout, start.stderr], sink)
const exited = new Promise((resolve) => start.on('exit', (code, signal) => resolve({ code, signal })))
let failure = null

try {
  const ready = await Promise.race([
    out.waitFor(/Tankwarden is running:\s+(http:\/\/\S+)/, READY_TIMEOUT_MS, 'printed address'),
    exited.then(({ code }) => Promise.reject(new Error(`npm start exited (${code}) before printing its address`))),
  ])
  const url = ready[1]
  log(`npm start printed ${url} (${seconds()})`)
  const password = out.text().match(/password for all: (\S+?)\)/)?.[1]
  const owner = out.text().match(/^\s+owner\s+(\S+@\S+)/m)?.[1]
  if (!password || !owner) throw new Error('npm start did not print the demo owner and password')
  await checkInBrowser(url, owner, password, dataDir)
} catch (error) {
  failure = error instanceof Error ? error.message : String(error)
}

// Ctrl-C, then everything of this run must be gone.
const pgPort = Number(out.text().match(/PostgreSQL is up on 127\.0\.0\.1:(\d+)/)?.[1] ?? 0)
try {
  process.kill(-start.pid, 'SIGINT')
} catch {
  /* already gone */
}
const stopped = await Promise.race([exited, new Promise((resolve) => setTimeout(() => resolve(null), STOP_TIMEOUT_MS).unref())])
const pgData = out.text().match(/PostgreSQL is up on \S+ \(data in (\S+)\)/)?.[1]
const leftovers = processesMentioning([dataDir, pgData, join(root, '.build', 'server.mjs'), join(root, 'simulator', 'index.ts')].filter(Boolean))
const busyPorts = []
for (const [name, p] of [
  ['HTTP', port],
  ['MQTT', mqttPort],
  ['fake SMTP', smtpPort],
  ['PostgreSQL', pgPort],
]) {
  if (p && !(await portIsFree(p))) busyPorts.push(`${name} ${p}`)
}
const problems = failure ? [failure] : []
if (!stopped) problems.push(`npm start did not stop within ${STOP_TIMEOUT_MS / 1000} s of SIGINT`)
else if (!/Stopped\./.test(out.text())) problems.push('npm start did not say it stopped')
if (leftovers.length) problems.push(`processes left after Ctrl-C:\n  ${leftovers.join('\n  ')}`)
if (busyPorts.length) problems.push(`ports still taken after Ctrl-C: ${busyPorts.join(', ')}`)
for (const line of leftovers) {
  const pid = Number(line.split(':')[0])
  try {
    process.kill(pid, 'SIGKILL')
  } catch {
    /* gone meanwhile */
  }
}
sink.end()

if (problems.length) {
  log(`SMOKE FAILED after ${seconds()}:\n  - ${problems.join('\n  - ')}`)
  log(`npm start's output and a screenshot are in ${dataDir}; the last lines:`)
  process.stdout.write(out.text().split('\n').slice(-40).join('\n') + '\n')
  process.exit(1)
}
rmSync(dataDir, { recursive: true, force: true })
log(`Smoke passed in ${seconds()}: the printed address opened, the owner signed in and saw the tanks, Ctrl-C stopped the app, the simulator and PostgreSQL.`)
