import type { PushPayload } from '@shared/schemas/push'

// The service worker's push and notification-click handling, written against a small scope of its
// own (no DOM or worker types), so the same code runs in the worker and under a unit test.

export const ACKNOWLEDGE = 'acknowledge'
const ICON = '/pwa-192x192.png'

/** What a notification keeps for its click: where it leads, and the acknowledge token if any. */
export type NotificationData = { url: string; ackToken?: string }

export type NotificationSpec = {
  title: string
  options: {
    body: string
    tag: string
    icon: string
    badge: string
    data: NotificationData
    actions: Array<{ action: string; title: string }>
    requireInteraction: boolean
    renotify: boolean
  }
}

export type WindowLike = { url: string; focus(): Promise<unknown>; navigate?(url: string): Promise<unknown> }

export type WorkerScope = {
  origin: string
  showNotification(title: string, options: NotificationSpec['options']): Promise<void>
  windows(): Promise<readonly WindowLike[]>
  openWindow(url: string): Promise<unknown>
  fetch(url: string, init: { method: string; headers: Record<string, string>; body: string }): Promise<{ ok: boolean; status: number }>
}

const text = (value: unknown, max: number) => (typeof value === 'string' ? value.slice(0, max) : '')

/** A path of this origin, or the start page: a payload never sends the person elsewhere. */
function ownPath(url: unknown): string {
  return typeof url === 'string' && /^\/(?!\/)/.test(url) ? url : '/'
}

/** The notification a push asks for. An unreadable payload still shows something, never nothing. */
export function notificationFor(data: unknown): NotificationSpec {
  const p = (data && typeof data === 'object' ? data : {}) as Partial<PushPayload>
  const ackToken = text(p.ackToken, 200)
  return {
    title: text(p.title, 200) || 'Tankwarden',
    options: {
      body: text(p.body, 500) || 'Something needs a look: open Tankwarden.',
      tag: text(p.tag, 100) || 'tankwarden',
      icon: ICON,
      badge: ICON,
      data: { url: ownPath(p.url), ...(ackToken ? { ackToken } : {}) },
      actions: ackToken ? [{ action: ACKNOWLEDGE, title: 'Acknowledge' }] : [],
      // An alarm stays on screen until someone deals with it; a newer one of the same incident buzzes again.
      requireInteraction: p.severity === 'alarm',
      renotify: true,
    },
  }
}

export async function onPush(scope: WorkerScope, data: unknown): Promise<void> {
  const { title, options } = notificationFor(data)
  await scope.showNotification(title, options)
}

/**
 * Acknowledge from the lock screen: the notification's single-use token goes to the same endpoint
 * as the mail's acknowledge link, no session and no window needed, and a short notification says
 * how it went. A tap anywhere else opens the incident, in a window of the app if one is open.
 */
export async function onNotificationClick(
  scope: WorkerScope,
  action: string,
  data: Partial<NotificationData> | null,
  tag: string,
): Promise<'acknowledged' | 'refused' | 'opened'> {
  const url = `${scope.origin}${ownPath(data?.url)}`
  if (action === ACKNOWLEDGE && data?.ackToken) {
    const status = await scope
      .fetch(`${scope.origin}/api/v1/ack-links/use`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ token: data.ackToken, note: 'Acknowledged from a notification' }),
      })
      .then((response) => (response.ok ? 200 : response.status))
      .catch(() => 0)
    const body =
      status === 200
        ? 'Nobody else will be asked. Open the incident when you can.'
        : status === 409
          ? 'This alert was already acknowledged.'
          : status === 410
            ? 'This alert has expired: acknowledge it in the app.'
            : 'No connection: acknowledge it in the app.'
    await scope.showNotification(status === 200 ? 'Acknowledged' : 'Not acknowledged', {
      body,
      tag,
      icon: ICON,
      badge: ICON,
      data: { url: ownPath(data.url) },
      actions: [],
      requireInteraction: false,
      renotify: false,
    })
    return status === 200 ? 'acknowledged' : 'refused'
  }
  const open = (await scope.windows()).find((w) => w.url.startsWith(scope.origin))
  if (open) {
    await open.navigate?.(url)
    await open.focus()
  } else {
    await scope.openWindow(url)
  }
  return 'opened'
}
