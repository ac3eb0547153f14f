import { describe, expect, it } from 'vitest'
import { ACKNOWLEDGE, notificationFor, onNotificationClick, onPush, type NotificationSpec, type WindowLike, type WorkerScope } from '../../src/sw/notifications'

/** A service worker's scope reduced to what the handlers use, recording what they do. */
function fakeScope(options: { ackStatus?: number; offline?: boolean; windows?: WindowLike[] } = {}) {
  const shown: Array<{ title: string; options: NotificationSpec['options'] }> = []
  const requests: Array<{ url: string; body: unknown }> = []
  const opened: string[] = []
  const scope: WorkerScope = {
    origin: 'https://shop.example',
    showNotification: async (title, o) => void shown.push({ title, options: o }),
    windows: async () => options.windows ?? [],
    openWindow: async (url) => void opened.push(url),
    fetch: async (url, init) => {
      if (options.offline) throw new TypeError('Failed to fetch')
      requests.push({ url, body: JSON.parse(init.body) })
      const status = options.ackStatus ?? 200
      return { ok: status < 300, status }
    },
  }
  return { scope, shown, requests, opened }
}

const alarm = { title: 'Alarm: Reef display', body: 'Temperature 29.6 °C', tag: 'incident-7', url: '/incidents/7', ackToken: 'a'.repeat(43), severity: 'alarm' }

describe('the service worker on a push', () => {
  it('shows the alert with an Acknowledge action, kept on screen for an alarm', async () => {
    const { scope, shown } = fakeScope()
    await onPush(scope, alarm)
    expect(shown).toEqual([
      {
        title: 'Alarm: Reef display',
        options: expect.objectContaining({
          body: 'Temperature 29.6 °C',
          tag: 'incident-7',
          data: { url: '/incidents/7', ackToken: alarm.ackToken },
          actions: [{ action: ACKNOWLEDGE, title: 'Acknowledge' }],
          requireInteraction: true,
        }),
      },
    ])
  })

  it('shows something for a payload it cannot read, and never a link to another site', () => {
    expect(notificationFor(null)).toMatchObject({ title: 'Tankwarden', options: { data: { url: '/' }, actions: [] } })
    expect(notificationFor({ ...alarm, url: '//elsewhere.example/x' }).options.data.url).toBe('/')
    expect(notificationFor({ ...alarm, url: 'https://elsewhere.example/' }).options.data.url).toBe('/')
    // The all-clear carries no token, so no action.
    expect(notificationFor({ title: 'Resolved: Reef display', body: 'Back in range', tag: 'incident-7', url: '/incidents/7' }).options.actions).toEqual([])
  })
})

describe('the service worker on a notification click', () => {
  it('Acknowledge sends the token to the acknowledge endpoint of its own origin and says so, without opening a window', async () => {
    const { scope, shown, requests, opened } = fakeScope()
    expect(await onNotificationClick(scope, ACKNOWLEDGE, { url: '/incidents/7', ackToken: alarm.ackToken }, 'incident-7')).toBe('acknowledged')
    expect(requests).toEqual([{ url: 'https://shop.example/api/v1/ack-links/use', body: { token: alarm.ackToken, note: 'Acknowledged from a notification' } }])
    expect(shown.map((n) => [n.title, n.options.tag])).toEqual([['Acknowledged', 'incident-7']])
    expect(opened).toEqual([])
  })

  it('says why when the token was used already, or there is no connection', async () => {
    const used = fakeScope({ ackStatus: 409 })
    expect(await onNotificationClick(used.scope, ACKNOWLEDGE, { url: '/incidents/7', ackToken: alarm.ackToken }, 'incident-7')).toBe('refused')
    expect(used.shown[0]).toMatchObject({ title: 'Not acknowledged', options: { body: 'This alert was already acknowledged.' } })
    const offline = fakeScope({ offline: true })
    await onNotificationClick(offline.scope, ACKNOWLEDGE, { url: '/incidents/7', ackToken: alarm.ackToken }, 'incident-7')
    expect(offline.shown[0].options.body).toMatch(/No connection/)
  })

  it('a tap opens the incident, in the open app window when there is one', async () => {
    const fresh = fakeScope()
    expect(await onNotificationClick(fresh.scope, '', { url: '/incidents/7' }, 'incident-7')).toBe('opened')
    expect(fresh.opened).toEqual(['https://shop.example/incidents/7'])

    const visits: string[] = []
    let focused = false
    const window: WindowLike = { url: 'https://shop.example/tanks', focus: async () => (focused = true), navigate: async (url) => void visits.push(url) }
    const open = fakeScope({ windows: [window] })
    await onNotificationClick(open.scope, '', { url: '/incidents/7' }, 'incident-7')
    expect({ visits, focused, opened: open.opened }).toEqual({ visits: ['https://shop.example/incidents/7'], focused: true, opened: [] })
  })
})
