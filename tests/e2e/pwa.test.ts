import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ackLinksService } from '../../server/incidents/ack-links'
import { incidentPush } from '../../server/push'
import { bearer, sampleTank } from '../helpers/app'
import { startFakePushService } from '../helpers/fake-push'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'

// The built app as a phone would have it: its service worker and manifest, a push shown by the
// worker itself (delivered through the DevTools protocol, as Chromium cannot reach a push service
// here), its Acknowledge action, and the Account page's devices.
let s: Awaited<ReturnType<typeof startAppForBrowser>>
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Phone Org')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON answer; each test reads the fields it checks
const api = async (path: string, token: string, init: RequestInit = {}): Promise<{ status: number; body: any }> => {
  const res = await fetch(`${s.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token) } })
  return { status: res.status, body: res.status === 204 ? null : await res.json() }
}

/** What the page and the worker offer, typed for these tests alone (the test program has no DOM types). */
type Note = { title: string; body: string; tag: string; data: { url: string; ackToken?: string }; actions: Array<{ action: string; title: string }> }
type Registration = { scope: string; active: { scriptURL: string } | null; getNotifications(): Promise<Note[]> }
type PageGlobals = {
  navigator: { serviceWorker: { ready: Promise<Registration> } }
  caches: { keys(): Promise<string[]>; open(name: string): Promise<{ keys(): Promise<Array<{ url: string }>> }> }
}
type WorkerGlobals = { registration: Registration; dispatchEvent(e: unknown): boolean; NotificationEvent: new (type: string, init: object) => unknown }

type Shown = { title: string; body: string; tag: string; data: { url: string; ackToken?: string }; actions: Array<{ action: string; title: string }> }
const notifications = (page: Page) =>
  page.evaluate(async () =>
    (await (await (globalThis as unknown as PageGlobals).navigator.serviceWorker.ready).getNotifications()).map((n) => ({
      title: n.title,
      body: n.body,
      tag: n.tag,
      data: n.data,
      actions: n.actions,
    })),
  ) as Promise<Shown[]>

async function openIncident(): Promise<number> {
  const site = org.siteIds[0]
  const tank = await api('/tanks', org.users.owner.token, { method: 'POST', body: JSON.stringify(sampleTank(site, { name: 'Reef display' })) })
  const device = await api('/devices', org.users.owner.token, {
    method: 'POST',
    body: JSON.stringify({ tankId: tank.body.id, name: 'Probe', metrics: ['temperature'], intervalSeconds: 60 }),
  })
  const t0 = Date.now() - 20 * 60_000
  const readings = Array.from({ length: 13 }, (_, i) => ({ metric: 'temperature', value: 28.4 + i * 0.1, time: new Date(t0 + i * 60_000).toISOString() }))
  await api('/readings', device.body.token, { method: 'POST', body: JSON.stringify({ v: 1, readings }) })
  await s.rules.engine.settle()
  const list = await api(`/incidents?tankId=${tank.body.id}`, org.users.owner.token)
  expect(list.body.items[0]?.state).toBe('open')
  return list.body.items[0].id
}

describe('the installable app', () => {
  let context: BrowserContext
  let page: Page

  it('registers its service worker after load and serves a manifest with our name, colours and icons', async () => {
    context = await browser.newContext({ viewport: { width: 390, height: 844 } })
    await context.grantPermissions(['notifications'], { origin: s.baseUrl })
    page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.keeper.email)
    const registration = await page.evaluate(async () => {
      const r = await (globalThis as unknown as PageGlobals).navigator.serviceWorker.ready
      return { scope: r.scope, script: r.active?.scriptURL ?? null }
    })
    expect(registration).toEqual({ scope: `${s.baseUrl}/`, script: `${s.baseUrl}/sw.js` })

    const href = await page.locator('link[rel="manifest"]').getAttribute('href')
    const manifest = (await (await fetch(new URL(href!, s.baseUrl))).json()) as {
      name: string
      start_url: string
      display: string
      theme_color: string
      icons: Array<{ src: string; sizes: string; type: string; purpose?: string }>
    }
    expect(manifest).toMatchObject({ name: 'Tankwarden', start_url: '/', display: 'standalone', theme_color: '#11606B' })
    expect(manifest.icons.map((i) => `${i.sizes}${i.purpose ? ` ${i.purpose}` : ''}`)).toEqual(
      expect.arrayContaining(['192x192', '512x512', '512x512 maskable']),
    )
    for (const icon of manifest.icons) {
      const res = await fetch(new URL(icon.src, s.baseUrl))
      expect(res.status, icon.src).toBe(200)
      expect(res.headers.get('content-type')).toBe('image/png')
    }
    expect(await page.locator('meta[name="theme-color"]').getAttribute('content')).toBe('#11606B')
    // Chromium's own verdict on installing it (a test browser context counts as incognito, which only it may not be).
    const cdp = await context.newCDPSession(page)
    const { installabilityErrors } = await cdp.send('Page.getInstallabilityErrors')
    expect(installabilityErrors.map((e) => e.errorId).filter((id) => id !== 'in-incognito')).toEqual([])
    await cdp.detach()
    // The worker script is asked for afresh at each visit, so a new version is found at once.
    expect((await fetch(`${s.baseUrl}/sw.js`)).headers.get('cache-control')).toBe('no-cache')
    // The API never comes from the worker's cache: every call reaches the server.
    const cached = await page.evaluate(async () => {
      const { caches } = globalThis as unknown as PageGlobals
      return (await Promise.all((await caches.keys()).map(async (k) => (await caches.open(k)).keys()))).flat().map((r) => r.url)
    })
    expect(cached.some((u) => new URL(u).pathname === '/index.html')).toBe(true)
    expect(cached.filter((u) => u.includes('/api/'))).toEqual([])
  })

  it('shows a pushed alert with an Acknowledge action that acknowledges the incident once, without opening the app', async () => {
    const incidentId = await openIncident()
    const ackUrl = await ackLinksService(s.ctx).create(incidentId, org.users.keeper.id)
    const payload = incidentPush('opened', {
      incidentId,
      severity: 'alarm',
      tankName: 'Reef display',
      siteName: 'Phone Org shop',
      what: 'temperature 29.6 °C, above 28 °C',
      metricLabel: 'Temperature',
      since: new Date().toISOString(),
      siteTimeZone: 'UTC',
      ackToken: new URL(ackUrl).searchParams.get('token')!,
    })
    const cdp = await context.newCDPSession(page)
    const registrationId = new Promise<string>((resolve) =>
      cdp.on('ServiceWorker.workerRegistrationUpdated', ({ registrations }) => {
        const found = registrations.find((r) => r.scopeURL === `${s.baseUrl}/` && !r.isDeleted)
        if (found) resolve(found.registrationId)
      }),
    )
    await cdp.send('ServiceWorker.enable')
    await cdp.send('ServiceWorker.deliverPushMessage', { origin: s.baseUrl, registrationId: await registrationId, data: JSON.stringify(payload) })
    await expect.poll(() => notifications(page), { timeout: 10_000 }).toHaveLength(1)
    const [shown] = await notifications(page)
    expect(shown).toMatchObject({
      title: 'Alarm: Reef display',
      tag: `incident-${incidentId}`,
      data: { url: `/incidents/${incidentId}`, ackToken: payload.ackToken },
      actions: [{ action: 'acknowledge', title: 'Acknowledge' }],
    })
    expect(shown.body).toMatch(/^Temperature 29\.6 °C, above 28 °C, since .* UTC · Phone Org shop$/)

    // The Acknowledge button, as the lock screen would press it: the worker's own click handler.
    const [worker] = context.serviceWorkers()
    const click = (action: string) =>
      worker.evaluate(async (action) => {
        const scope = globalThis as unknown as WorkerGlobals
        const [notification] = await scope.registration.getNotifications()
        scope.dispatchEvent(new scope.NotificationEvent('notificationclick', { notification, action }))
      }, action)
    await click('acknowledge')
    await expect.poll(async () => (await api(`/incidents/${incidentId}`, org.users.keeper.token)).body.state, { timeout: 10_000 }).toBe('acknowledged')
    await expect.poll(async () => (await notifications(page)).map((n) => n.title), { timeout: 10_000 }).toEqual(['Acknowledged'])
    expect((await api(`/incidents/${incidentId}`, org.users.keeper.token)).body.acknowledgedBy).toBe(org.users.keeper.id)
    // A second use of the same token is refused.
    const again = await fetch(`${s.baseUrl}/api/v1/ack-links/use`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ token: payload.ackToken }),
    })
    expect(again.status).toBe(409)
  })

  it("lists the person's devices on the Account page, an expired one with what to do", async () => {
    const fake = await startFakePushService()
    try {
      const phone = await api('/push/subscriptions', org.users.keeper.token, {
        method: 'POST',
        body: JSON.stringify(fake.subscribe('Android phone, Chrome').body),
      })
      const old = await api('/push/subscriptions', org.users.keeper.token, { method: 'POST', body: JSON.stringify(fake.subscribe('iPad, Safari').body) })
      await s.ctx.models.PushSubscription.update({ status: 'expired', expiredAt: new Date() }, { where: { id: old.body.id } })
      expect(phone.status).toBe(201)
    } finally {
      await fake.close()
    }
    for (const [name, viewport] of [
      ['account-notifications-phone', { width: 390, height: 844 }],
      ['account-notifications-desktop', { width: 1280, height: 800 }],
    ] as const) {
      await page.setViewportSize(viewport)
      await page.goto(`${s.baseUrl}/account`)
      await page.locator('[data-test="device-row"]').first().waitFor({ timeout: 20_000 })
      expect(await page.locator('[data-test="device-row"]').allTextContents()).toEqual([
        expect.stringMatching(/^Android phone, Chrome.*Added/),
        expect.stringMatching(/^iPad, Safari.*Stopped .*Enable notifications again on that device/),
      ])
      await expect.poll(() => page.getByRole('button', { name: 'Enable on this device' }).count()).toBe(1)
      await page.locator('[data-test="notification-devices"]').scrollIntoViewIfNeeded()
      await shot(page, name)
    }
    // Chromium here has no push service to sign up with: the page says so instead of failing silently.
    await page.getByRole('button', { name: 'Enable on this device' }).click()
    const outcome = page.locator('[data-test="notification-devices"] [role="alert"]').or(page.locator('[data-test="device-row"]').nth(2))
    await outcome.first().waitFor({ timeout: 20_000 })
    expect(await outcome.first().textContent()).toMatch(/could not sign up with its push service|Linux computer, Chrome/)
    await page.getByRole('button', { name: 'Remove iPad, Safari' }).click()
    await expect.poll(() => page.locator('[data-test="device-row"]').count()).toBe(1)
    await context.close()
  })
})
