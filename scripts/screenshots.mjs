// `npm run screenshots`: every screen of a running Tankwarden (start it first with `npm start`), at
// 1920×1080 and 390×844, in the light and the dark theme, as PNGs in `screenshots/` (git-ignored), so
// anyone can look at the whole product in a minute. Signs in as the demo owner unless told otherwise:
//   npm run screenshots -- [--url http://127.0.0.1:8080] [--email owner@…] [--password …] [--out folder]
// Node built-ins only at the top: playwright-core is imported once the packages are installed.
import { mkdirSync, readFileSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { parseArgs } from 'node:util'
import { ensureChromium } from './lib/chromium.mjs'
import { log } from './lib/run.mjs'
import { routeNamesIn, screensOf } from './lib/screens.mjs'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
const { values: args } = parseArgs({
  options: {
    url: { type: 'string', default: process.env.APP_URL ?? 'http://127.0.0.1:8080' },
    email: { type: 'string', default: 'owner@marrowfen.example' },
    password: { type: 'string', default: 'tankwarden-demo' },
    out: { type: 'string', default: join(root, 'screenshots') },
  },
})
const base = args.url.replace(/\/$/, '')
const api = async (path, token, init = {}) => {
  const response = await fetch(`${base}/api/v1${path}`, {
    ...init,
    headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}), ...init.headers },
  })
  if (!response.ok) throw new Error(`${init.method ?? 'GET'} ${path} answered ${response.status}: is Tankwarden running at ${base}?`)
  return response.status === 204 ? null : response.json()
}

const { token } = await api('/auth/sign-in', null, { method: 'POST', body: JSON.stringify({ email: args.email, password: args.password }) })
const tanks = (await api('/tanks?pageSize=100', token)).items
const sites = await api('/sites', token)
const incidents = (await api('/incidents?pageSize=1', token)).items ?? []
const clients = await api('/clients', token)
const visits = await api('/visits', token)
const tank = tanks.find((t) => t.status?.openIncidents?.length) ?? tanks[0]

const all = screensOf({ tank, site: sites[0], incident: incidents[0], client: clients[0], visit: visits[0] })
// Every screen of the router, or the run fails: a new screen cannot be left out of the pictures.
const routeNames = routeNamesIn(readFileSync(join(root, 'src/router/routes.ts'), 'utf8'))
const missing = routeNames.filter((name) => !all.some((s) => s.route === name))
if (missing.length) throw new Error(`scripts/lib/screens.mjs has no screen for the route(s) ${missing.join(', ')}`)
const screens = all.filter((s) => s.path)
const skipped = all.filter((s) => !s.path).map((s) => s.route)
if (skipped.length) log(`no record to open for ${skipped.join(', ')} (the demo has none): left out`)
const SIZES = [
  ['desktop', { width: 1920, height: 1080 }],
  ['phone', { width: 390, height: 844 }],
]
const THEMES = [
  ['light', 'tankwardenLight'],
  ['dark', 'tankwardenDark'],
]

const chromiumPath = ensureChromium()
if (!chromiumPath) throw new Error('Chromium is not available')
const { chromium } = await import('playwright-core')
const browser = await chromium.launch({ executablePath: chromiumPath, headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage'] })
const out = resolve(args.out)
mkdirSync(out, { recursive: true })
let count = 0
try {
  for (const [sizeName, viewport] of SIZES)
    for (const [themeName, theme] of THEMES)
      for (const signedIn of [false, true]) {
        const context = await browser.newContext({ viewport })
        // The session (when signed in) and the theme, as the app keeps them (src/api/session.ts, useThemePreference.ts).
        await context.addInitScript(
          ([token, theme]) => {
            if (token) localStorage.setItem('tw.token', token)
            localStorage.setItem('tw.theme', theme)
          },
          [signedIn ? token : null, theme],
        )
        const page = await context.newPage()
        for (const { route, path, stub } of screens.filter((s) => !!s.signedIn === signedIn)) {
          for (const [apiPath, body] of Object.entries(stub ?? {}))
            await page.route(`${base}${apiPath}`, (r) => r.fulfill({ status: 200, contentType: 'application/json', body: JSON.stringify(body) }))
          await page.goto(`${base}${path}`, { waitUntil: 'networkidle', timeout: 60_000 }).catch(() => undefined)
          // A first load on a busy machine can outlast network idle: wait for the page to say something too.
          await page
            .locator('#app :is(h1, .v-card, .v-main, main)')
            .first()
            .waitFor({ timeout: 30_000 })
            .catch(() => undefined)
          await page.waitForLoadState('networkidle', { timeout: 10_000 }).catch(() => undefined)
          await page.waitForTimeout(500)
          await page.screenshot({ path: join(out, `${route}-${sizeName}-${themeName}.png`), fullPage: sizeName === 'phone' })
          await page.unrouteAll()
          count++
        }
        await context.close()
      }
} finally {
  await browser.close()
}
log(`${count} screenshots of ${screens.length} screens in ${out}`)
