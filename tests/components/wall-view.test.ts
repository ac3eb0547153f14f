import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'

vi.mock('@/api/wall', () => ({
  getWall: vi.fn(),
  fetchWallTrends: vi.fn(),
  listWallCredentials: vi.fn(),
  createWallCredential: vi.fn(),
  revokeWallCredential: vi.fn(),
}))

import { setClockStyle } from '@shared/time'
import { fetchWallTrends, getWall } from '@/api/wall'
import { resetLiveSocket } from '@/composables/useLiveSocket'
import WallView from '@/views/WallView.vue'
import { wallPayload } from './fixtures/wall'
import { mountView } from './mount'

function screen(width: number, height: number) {
  Object.defineProperty(window, 'innerWidth', { value: width, configurable: true })
  Object.defineProperty(window, 'innerHeight', { value: height, configurable: true })
}

async function mountWall(count: number, overrides: Parameters<typeof wallPayload>[1] = {}) {
  vi.mocked(getWall).mockResolvedValue(wallPayload(count, overrides))
  const started = performance.now()
  const { wrapper } = await mountView(WallView, { props: { siteId: 3 } })
  await flushPromises()
  return { wrapper, elapsedMs: performance.now() - started }
}

beforeEach(() => {
  vi.mocked(getWall).mockReset()
  screen(1920, 1080)
})

afterEach(() => {
  resetLiveSocket()
  vi.useRealTimers()
})

describe('WallView', () => {
  it('shows the header: site, on duty, incidents, and a dash for unknown overdue care', async () => {
    const { wrapper } = await mountWall(3)
    expect(wrapper.text()).toContain('Back fish room')
    expect(wrapper.find('[data-test="wall-on-duty"]').text()).toContain('Sam Keeper')
    expect(wrapper.find('[data-test="wall-incidents"]').text()).toBe('Open incidents: 2')
    expect(wrapper.find('[data-test="wall-overdue"]').text()).toBe('Care overdue: —')
    expect(wrapper.findAll('article.tw-tile')).toHaveLength(3)
    expect(wrapper.find('[data-test="wall-page"]').exists()).toBe(false)
  })

  it("writes its clock the organisation's way, which the wall's answer brings for a display with nobody signed in", async () => {
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(Date.parse('2026-03-03T14:05:00.000Z'))
    try {
      const { wrapper } = await mountWall(1, { site: { id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', clockStyle: '12h' } })
      expect(wrapper.find('[data-test="wall-clock"]').text()).toContain('3:05 pm')
    } finally {
      setClockStyle('24h')
    }
  })

  it('keeps the order the server sent', async () => {
    const payload = wallPayload(3)
    payload.tanks = [{ ...payload.tanks[2]!, state: 'alarm' }, { ...payload.tanks[0]!, state: 'watch' }, payload.tanks[1]!]
    vi.mocked(getWall).mockResolvedValue(payload)
    const { wrapper } = await mountView(WallView, { props: { siteId: 3 } })
    await flushPromises()
    expect(wrapper.findAll('.tw-tile__name').map((n) => n.text())).toEqual(['Tank 3', 'Tank 1', 'Tank 2'])
  })

  it('pages 200 tanks on a 1920 × 1080 screen, 24 at a time, turning every 15 s', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval', 'setTimeout', 'clearTimeout', 'Date'] })
    vi.setSystemTime(Date.parse('2026-03-03T12:00:00.000Z'))
    const { wrapper, elapsedMs } = await mountWall(200)
    expect(wrapper.findAll('article.tw-tile')).toHaveLength(24)
    expect(wrapper.find('[data-test="wall-page"]').text()).toBe('page 1 of 9')
    expect(wrapper.find('.tw-tile__name').text()).toBe('Tank 1')

    await vi.advanceTimersByTimeAsync(15_000)
    expect(wrapper.find('[data-test="wall-page"]').text()).toBe('page 2 of 9')
    expect(wrapper.find('.tw-tile__name').text()).toBe('Tank 25')
    // jsdom is far slower than a browser (seconds here against tens of milliseconds in Chromium): the
    // time is printed, and the tile count above is what catches a layout that renders every page at once.
    console.info(`wall: first page of 200 tanks rendered in ${elapsedMs.toFixed(0)} ms (jsdom)`)
  }, 90_000)

  it('asks for the trend lines a page lacks when that page comes up, and draws them', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval', 'setTimeout', 'clearTimeout', 'Date'] })
    vi.setSystemTime(Date.parse('2026-03-03T12:00:00.000Z'))
    const payload = wallPayload(48)
    // The answer brought the first screenful's lines only.
    payload.tanks = payload.tanks.map((t) => (t.id > 24 ? { ...t, trend: null } : t))
    vi.mocked(getWall).mockResolvedValue(payload)
    const line = [
      { t: '2026-03-03T10:00:00.000Z', value: 26.1 },
      { t: '2026-03-03T11:00:00.000Z', value: 26.4 },
    ]
    vi.mocked(fetchWallTrends).mockReset()
    vi.mocked(fetchWallTrends).mockImplementation(async (_site, ids) => ({ trends: ids.map((tankId) => ({ tankId, trend: line })) }))
    const { wrapper } = await mountView(WallView, { props: { siteId: 3 } })
    await flushPromises()
    expect(wrapper.findAll('[data-test="tile-trend"]')).toHaveLength(24)
    expect(fetchWallTrends).not.toHaveBeenCalled()

    await vi.advanceTimersByTimeAsync(15_000)
    await flushPromises()
    expect(wrapper.find('.tw-tile__name').text()).toBe('Tank 25')
    expect(fetchWallTrends).toHaveBeenCalledTimes(1)
    expect(fetchWallTrends).toHaveBeenCalledWith(
      3,
      Array.from({ length: 24 }, (_, i) => i + 25),
    )
    expect(wrapper.findAll('[data-test="tile-trend"]')).toHaveLength(24)

    // Back to the first page and on to the second again within five minutes: nothing asked again.
    await vi.advanceTimersByTimeAsync(30_000)
    expect(fetchWallTrends).toHaveBeenCalledTimes(1)
  }, 30_000)

  it('scrolls all 200 tiles on a phone without drawing charts that are out of view', async () => {
    screen(390, 844)
    const { wrapper, elapsedMs } = await mountWall(200)
    expect(wrapper.findAll('article.tw-tile')).toHaveLength(200)
    expect(wrapper.find('[data-test="wall-page"]').exists()).toBe(false)
    expect(wrapper.findAll('.tw-spark')).toHaveLength(0)
    console.info(`wall: 200 tiles on a phone rendered in ${elapsedMs.toFixed(0)} ms (jsdom)`)
  }, 90_000)

  it('says plainly when the connection is down', async () => {
    const { wrapper } = await mountWall(1)
    // No credential in this test, so the socket cannot connect.
    expect(wrapper.find('[data-test="wall-status"]').text()).toBe('Reconnecting…')
  })

  it('explains a refused display key instead of a blank screen', async () => {
    const { ApiError } = await import('@/api/errors')
    vi.mocked(getWall).mockRejectedValue(new ApiError({ status: 401, code: 'unauthenticated', message: 'no' }))
    const { wrapper } = await mountView(WallView, { props: { siteId: 3 } })
    await flushPromises()
    expect(wrapper.find('[data-test="wall-error"]').text()).toBe('This display may not show this site. Ask an owner for a new wall link.')
  })
})

describe('WallView live', () => {
  it('shows Live while the socket is up, Reconnecting… when it drops, and updates a tile from a frame', async () => {
    const { FakeSocket } = await import('./fixtures/fake-socket')
    FakeSocket.instances = []
    vi.stubGlobal('WebSocket', FakeSocket)
    localStorage.setItem('tw.wallKey', 'tww_display_key_123')
    localStorage.setItem('tw.wallSiteId', '3')
    try {
      const { wrapper } = await mountWall(2)
      const socket = FakeSocket.instances[0]!
      socket.open()
      socket.frame({ type: 'ready', role: 'wall' })
      await flushPromises()
      expect(wrapper.find('[data-test="wall-status"]').text()).toBe('Live')
      expect(socket.sent[1]).toEqual({ type: 'subscribe', siteId: 3 })

      socket.frame({ type: 'readings', readings: [{ tankId: 2, metric: 'temperature', time: new Date().toISOString(), value: 27.46, source: 'device' }] })
      await flushPromises()
      expect(wrapper.findAll('[data-test="tile-temperature"]')[1]!.text()).toBe('27.5°C')

      socket.drop()
      await flushPromises()
      expect(wrapper.find('[data-test="wall-status"]').text()).toBe('Reconnecting…')
    } finally {
      vi.unstubAllGlobals()
    }
  })
})
