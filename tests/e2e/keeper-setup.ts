import type { Locator, Page, WebSocket } from 'playwright-core'
import { bearer, sampleTank } from '../helpers/app'
import type { startAppForBrowser } from './browser'
import { until } from '../helpers/wait'

export type App = Awaited<ReturnType<typeof startAppForBrowser>>
export const MINUTE_MS = 60_000
/** The first page of a run loads the whole client on a 2-core machine: give it room. */
export const FIRST_LOAD_MS = 30_000

export interface ApiAnswer {
  status: number
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON answer, typed loosely like supertest's res.body: each test reads the fields it checks
  body: any
}

/** One call to the public API with a bearer token, as any outside client would make it. */
export async function api(app: App, path: string, token: string, init: RequestInit = {}): Promise<ApiAnswer> {
  const res = await fetch(`${app.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token) } })
  const text = await res.text()
  return { status: res.status, body: text ? JSON.parse(text) : null }
}

/**
 * A tank made through the API (so it gets the starter watch rules) with one temperature device.
 * The device reports every 10 minutes, so a slow run does not see it fall quiet mid-test.
 */
export async function tankWithProbe(app: App, ownerToken: string, siteId: number, name: string, sortOrder = 0) {
  const tank = await api(app, '/tanks', ownerToken, { method: 'POST', body: JSON.stringify(sampleTank(siteId, { name, sortOrder })) })
  if (tank.status !== 201) throw new Error(`tank ${name}: ${tank.status} ${JSON.stringify(tank.body)}`)
  const device = await api(app, '/devices', ownerToken, {
    method: 'POST',
    body: JSON.stringify({ tankId: tank.body.id, name: `${name} probe`, metrics: ['temperature'], intervalSeconds: 600 }),
  })
  if (device.status !== 201) throw new Error(`device ${name}: ${device.status} ${JSON.stringify(device.body)}`)
  return { tankId: tank.body.id as number, deviceId: device.body.device.id as number, token: device.body.token as string }
}

/** Temperatures over HTTP: `[time ms, °C]` pairs; answers how many were accepted. */
export async function postTemperatures(app: App, deviceToken: string, points: Array<[number, number]>): Promise<number> {
  const body = { v: 1, readings: points.map(([at, value]) => ({ metric: 'temperature', value, time: new Date(at).toISOString() })) }
  const answer = await api(app, '/readings', deviceToken, { method: 'POST', body: JSON.stringify(body) })
  return answer.body?.accepted ?? -1
}

/** The rule engine runs only in the instance holding the advisory lock; wait until this one does. */
export async function waitForRuleLeader(app: App) {
  if (!(await until(() => app.rules.lock.isLeader, 10_000, 50))) throw new Error('the rule engine never became leader')
}

/** Resolves when the page's live socket confirms a subscription; set up before the page loads. */
export function liveSubscribed(page: Page): Promise<void> {
  return new Promise((resolve) => {
    page.on('websocket', (ws: WebSocket) => {
      ws.on('framereceived', ({ payload }) => {
        if (typeof payload === 'string' && payload.includes('"subscribed"')) resolve()
      })
    })
  })
}

// The server tsconfig has no DOM types; these callbacks run in the page and reach its globals.
type PageGlobals = {
  localStorage: { getItem(key: string): string | null; setItem(key: string, value: string): void }
  getComputedStyle(el: unknown): { backgroundColor: string }
}

export function readStorage(page: Page, keys: string[]): Promise<Record<string, string | null>> {
  return page.evaluate((names) => {
    const storage = (globalThis as unknown as PageGlobals).localStorage
    return Object.fromEntries(names.map((k) => [k, storage.getItem(k)]))
  }, keys)
}

export function writeStorage(page: Page, key: string, value: string): Promise<void> {
  return page.evaluate(([k, v]) => (globalThis as unknown as PageGlobals).localStorage.setItem(k!, v!), [key, value])
}

export function backgroundOf(target: Locator): Promise<string> {
  return target.evaluate((el) => (globalThis as unknown as PageGlobals).getComputedStyle(el).backgroundColor)
}
