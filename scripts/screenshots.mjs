// `npm run screenshots`: every screen of a running Tankwarden (start it first with `npm start`), at
// 1920×1080 and 390×844, in the light and the dark theme, as PNGs in `screenshots/` (git-ignored), so
// anyone can look at the whole product in a minute. Signs in as the demo owner unless told otherwise:
//   npm run screenshots -- [--url http://127.0.0.1:8080] [--email owner@…] [--password …] [--out folder]
// Node built-ins only at the top: playwright-core is imported once the packages are installed.
import { mkdirSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { parseArgs } from 'node:util'
import { ensureChromium } from './lib/chromium.mjs'
import { log } from './lib/run.mjs'

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
const tank = tanks.find((t) => t.status?.openIncidents?.length) ?? tanks[0]
const site = sites[0]

/** Every screen a signed-in owner can open, by the name its file gets. */
const screens = [
  ['overview', '/'],
  ['tanks', '/tanks'],
  ['tank', tank && `/tanks/${tank.id}`],
  ['tank-test-kit', tank && `/tanks/${tank.id}/test-kit`],
  ['tank-edit', tank && `/tanks/${tank.id}/edit`],
  ['tank-build', tank && `/tanks/${tank.id}/build`],
  ['tank-new', '/tanks/new'],
  ['incidents', '/incidents'],
  ['incident', incidents[0] && `/incidents/${incidents[0].id}`],
  ['care-today', '/care/today'],
  ['livestock', '/livestock'],
  ['supplies', '/supplies'],
  ['report', '/reports'],
  ['sites', '/sites'],
  ['roster', site && `/sites/${site.id}/roster`],
  ['import', '/import'],
  ['users', '/users'],
  ['backup', '/backup'],
  ['account', '/account'],
  ['dev-mail', '/dev/mail'],
  ['wall', site && `/wall/${site.id}`],
].filter(([, path]) => path)
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
    for (const [themeName, theme] of THEMES) {
      const context = await browser.newContext({ viewport })
      // The signed-in session and the theme, as the app keeps them (src/api/session.ts, useThemePreference.ts).
      await context.addInitScript(
        ([token, theme]) => {
          localStorage.setItem('tw.token', token)
          localStorage.setItem('tw.theme', theme)
        },
        [token, theme],
      )
      const page = await context.newPage()
      for (const [name, path] of screens) {
        await page.goto(`${base}${path}`, { waitUntil: 'networkidle', timeout: 60_000 }).catch(() => undefined)
        await page.waitForTimeout(500)
        const file = join(out, `${name}-${sizeName}-${themeName}.png`)
        await page.screenshot({ path: file, fullPage: sizeName === 'phone' })
        count++
      }
      await context.close()
    }
} finally {
  await browser.close()
}
log(`${count} screenshots of ${screens.length} screens in ${out}`)
