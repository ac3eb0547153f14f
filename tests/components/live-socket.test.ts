import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { LiveReading } from '@shared/schemas/live'
import { FakeSocket } from './fixtures/fake-socket'
import { liveSocketUrl, nextRetryDelay, resetLiveSocket, subscribeLive, useLiveSocket } from '@/composables/useLiveSocket'

const latestSocket = () => FakeSocket.instances[FakeSocket.instances.length - 1]!
const reading = (tankId: number, time: string, value = 25): LiveReading => ({ tankId, metric: 'temperature', time, value, source: 'device' })

beforeEach(() => {
  vi.useFakeTimers()
  FakeSocket.instances = []
  vi.stubGlobal('WebSocket', FakeSocket)
  localStorage.setItem('tw.token', 'person-token-123')
})

afterEach(() => {
  resetLiveSocket()
  vi.useRealTimers()
  vi.unstubAllGlobals()
})

describe('live socket', () => {
  it('picks ws or wss from the page', () => {
    expect(liveSocketUrl({ protocol: 'https:', host: 'shop.example:8443' })).toBe('wss://shop.example:8443/ws')
    expect(liveSocketUrl({ protocol: 'http:', host: 'localhost:5173' })).toBe('ws://localhost:5173/ws')
  })

  it('backs off 1 s, 2 s, 4 s … up to 30 s', () => {
    const delays = [1000]
    for (let i = 0; i < 6; i++) delays.push(nextRetryDelay(delays[delays.length - 1]!))
    expect(delays).toEqual([1000, 2000, 4000, 8000, 16000, 30000, 30000])
  })

  it('shares one socket, authenticates first, then subscribes every listener', () => {
    const { status } = useLiveSocket()
    const wall = vi.fn()
    const tank = vi.fn()
    subscribeLive({ siteId: 3 }, wall)
    subscribeLive({ tankIds: [12] }, tank)
    expect(FakeSocket.instances).toHaveLength(1)
    expect(status.value).toBe('connecting')

    const socket = latestSocket()
    socket.open()
    expect(socket.sent).toEqual([{ type: 'auth', token: 'person-token-123' }])
    socket.frame({ type: 'ready', role: 'keeper' })
    expect(status.value).toBe('live')
    expect(socket.sent.slice(1)).toEqual([
      { type: 'subscribe', siteId: 3 },
      { type: 'subscribe', tankIds: [12] },
    ])

    socket.frame({ type: 'readings', readings: [reading(12, '2026-03-03T12:00:00.000Z'), reading(13, '2026-03-03T12:00:01.000Z')] })
    expect(wall).toHaveBeenCalledTimes(1)
    expect(wall.mock.calls[0]![0]).toHaveLength(2)
    expect(tank.mock.calls[0]![0]).toEqual([reading(12, '2026-03-03T12:00:00.000Z')])
  })

  it('reconnects with backoff and catches up from the newest reading it saw', () => {
    const { status } = useLiveSocket()
    subscribeLive({ tankIds: [12] }, () => undefined)
    let socket = latestSocket()
    socket.open()
    socket.frame({ type: 'ready', role: 'keeper' })
    socket.frame({ type: 'readings', readings: [reading(12, '2026-03-03T12:00:05.000Z'), reading(12, '2026-03-03T12:00:02.000Z')] })

    socket.drop()
    expect(status.value).toBe('offline')
    vi.advanceTimersByTime(999)
    expect(FakeSocket.instances).toHaveLength(1)
    vi.advanceTimersByTime(1)
    expect(FakeSocket.instances).toHaveLength(2)

    // The second attempt fails too: the wait doubles.
    latestSocket().drop()
    vi.advanceTimersByTime(1999)
    expect(FakeSocket.instances).toHaveLength(2)
    vi.advanceTimersByTime(1)
    socket = latestSocket()
    socket.open()
    socket.frame({ type: 'ready', role: 'keeper' })
    expect(socket.sent[1]).toEqual({ type: 'subscribe', tankIds: [12], since: '2026-03-03T12:00:05.000Z' })
    expect(status.value).toBe('live')

    // Success resets the backoff.
    socket.drop()
    vi.advanceTimersByTime(1000)
    expect(FakeSocket.instances).toHaveLength(4)
  })

  it('closes when the last listener leaves and unsubscribes tanks nobody else wants', () => {
    const { status } = useLiveSocket()
    const stopA = subscribeLive({ tankIds: [1, 2] }, () => undefined)
    const stopB = subscribeLive({ tankIds: [2] }, () => undefined)
    const socket = latestSocket()
    socket.open()
    socket.frame({ type: 'ready', role: 'keeper' })
    stopA()
    expect(socket.sent[socket.sent.length - 1]).toEqual({ type: 'unsubscribe', tankIds: [1] })
    stopB()
    expect(socket.readyState).toBe(FakeSocket.CLOSED)
    expect(status.value).toBe('offline')
    vi.advanceTimersByTime(60_000)
    expect(FakeSocket.instances).toHaveLength(1)
  })

  it('uses the wall key when no person is signed in', () => {
    localStorage.removeItem('tw.token')
    localStorage.setItem('tw.wallKey', 'tww_display_key_123')
    localStorage.setItem('tw.wallSiteId', '3')
    subscribeLive({ siteId: 3 }, () => undefined)
    latestSocket().open()
    expect(latestSocket().sent[0]).toEqual({ type: 'auth', token: 'tww_display_key_123' })
  })

  it('gives up on a socket that has gone silent and opens a new one', () => {
    subscribeLive({ tankIds: [1] }, () => undefined)
    const socket = latestSocket()
    socket.open()
    socket.frame({ type: 'ready', role: 'keeper' })
    vi.advanceTimersByTime(20_000)
    expect(socket.sent[socket.sent.length - 1]).toEqual({ type: 'ping' })
    vi.advanceTimersByTime(40_000)
    expect(socket.readyState).toBe(FakeSocket.CLOSED)
    vi.advanceTimersByTime(1000)
    expect(FakeSocket.instances).toHaveLength(2)
  })
})

describe('incident frames', () => {
  const change = (siteId: number, tankId: number) => ({ type: 'incident', incidentId: 55, tankId, siteId, state: 'acknowledged' })

  it('reach the listeners of that site or tank only', () => {
    const bySite = vi.fn()
    const byTank = vi.fn()
    const readingsOnly = vi.fn()
    subscribeLive({ siteId: 3 }, () => undefined, bySite)
    subscribeLive({ tankIds: [12] }, () => undefined, byTank)
    subscribeLive({ siteId: 3 }, readingsOnly)
    const socket = latestSocket()
    socket.open()
    socket.frame({ type: 'ready', role: 'keeper' })
    socket.frame(change(3, 14))
    socket.frame(change(4, 12))
    expect(bySite.mock.calls).toEqual([[change(3, 14)]])
    expect(byTank.mock.calls).toEqual([[change(4, 12)]])
    expect(readingsOnly).not.toHaveBeenCalled()
  })

  it('become one refetch per burst, and the list refetches every minute anyway', async () => {
    const { effectScope } = await import('vue')
    const { useIncidentRefresh, INCIDENT_REFETCH_MS } = await import('@/composables/useIncidentRefresh')
    const reload = vi.fn()
    const scope = effectScope()
    scope.run(() => useIncidentRefresh(() => [{ siteId: 3 }], reload))
    const socket = latestSocket()
    socket.open()
    socket.frame({ type: 'ready', role: 'viewer' })
    expect(socket.sent[1]).toEqual({ type: 'subscribe', siteId: 3 })
    socket.frame(change(3, 14))
    socket.frame(change(3, 15))
    vi.advanceTimersByTime(1000)
    expect(reload).toHaveBeenCalledTimes(1)
    vi.advanceTimersByTime(INCIDENT_REFETCH_MS)
    expect(reload).toHaveBeenCalledTimes(2)
    scope.stop()
    vi.advanceTimersByTime(INCIDENT_REFETCH_MS)
    expect(reload).toHaveBeenCalledTimes(2)
    expect(socket.readyState).toBe(FakeSocket.CLOSED)
  })
})
