// scratch: where does the wall's time go
import { chromium } from 'playwright-core'
import { writeFileSync } from 'node:fs'
import { testConfig } from '../server/config'
import { closeContext, createContext } from '../server/bootstrap'
import { migrate } from '../server/db/migrate'
import { authService } from '../server/services/auth'
import { wallService } from '../server/services/wall'
import { benchShop } from './fixtures'
import { startAppProcess } from './suite/processes'
import { tenRulesPerTank, wallHistory } from './suite/measures'

const tanks = Number(process.env.TANKS ?? 1000)
const databaseUrl = process.env.DATABASE_URL!
const ctx = createContext(testConfig({ databaseUrl, logLevel: 'silent' }))
await ctx.sequelize.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public')
await migrate(ctx.sequelize)
const shop = await benchShop(ctx, tanks)
await tenRulesPerTank(ctx, shop)
const owner = await ctx.models.User.create({ organizationId: shop.organizationId, email: 'bench@bench.example', name: 'Bench', role: 'owner', passwordHash: 'x' })
await authService(ctx).openSession(owner)
const actor = { kind: 'user' as const, userId: owner.id, organizationId: shop.organizationId, role: 'owner' as const, siteIds: null, jti: 'bench' }
const { link } = await wallService(ctx).createCredential(actor as never, shop.siteId, 'Bench display')
await wallHistory(ctx, shop)
const app = await startAppProcess(databaseUrl)
const key = new URL(link, 'http://x').searchParams.get('key')!
for (let i = 0; i < 6; i++) {
  const t = performance.now()
  const res = await fetch(`http://127.0.0.1:${app.port}/api/v1/sites/${shop.siteId}/wall`, { headers: { authorization: `Bearer ${key}` } })
  const body = await res.text()
  console.log(`api ${res.status} ${body.length} bytes ${Math.round(performance.now() - t)} ms`)
  if (i === 0) writeFileSync('/tmp/wall.json', body)
}
// in-process timing of the service pieces
const t0 = performance.now()
await wallService(ctx).get({ kind: 'wall', siteId: shop.siteId, organizationId: shop.organizationId } as never, shop.siteId).catch((e) => console.log('svc', e.message))
console.log(`service in bench process ${Math.round(performance.now() - t0)} ms`)
const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium', headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage'] })
for (let i = 0; i < 3; i++) {
  const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } })
  const page = await context.newPage()
  const cdp = await context.newCDPSession(page)
  if (i === 2) {
    await cdp.send('Profiler.enable')
    await cdp.send('Profiler.setSamplingInterval', { interval: 200 })
    await cdp.send('Profiler.start')
  }
  const t = performance.now()
  await page.goto(`http://127.0.0.1:${app.port}${link}`)
  await page.locator('article').first().waitFor({ timeout: 30_000 })
  const total = Math.round(performance.now() - t)
  const marks = await page.evaluate(() => {
    const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming
    const res = performance.getEntriesByType('resource') as PerformanceResourceTiming[]
    const paint = performance.getEntriesByType('paint').map((p) => `${p.name} ${Math.round(p.startTime)}`)
    return { dcl: Math.round(nav.domContentLoadedEventEnd), load: Math.round(nav.loadEventEnd), paint, res: res.map((r) => `${r.name.replace(/^.*\//, '').slice(0, 40)} ${Math.round(r.startTime)}-${Math.round(r.responseEnd)}`) }
  })
  console.log(`run ${i}: ${total} ms`, JSON.stringify(marks))
  if (i === 2) {
    const { profile } = (await cdp.send('Profiler.stop')) as { profile: unknown }
    writeFileSync('/tmp/wall.cpuprofile', JSON.stringify(profile))
  }
  await context.close()
}
await browser.close()
await app.stop()
await closeContext(ctx)
process.exit(0)
