/// <reference lib="webworker" />
import { cleanupOutdatedCaches, createHandlerBoundToURL, precacheAndRoute } from 'workbox-precaching'
import { NavigationRoute, registerRoute } from 'workbox-routing'
import { onNotificationClick, onPush, type NotificationData, type WorkerScope } from './sw/notifications'

declare const self: ServiceWorkerGlobalScope & { __WB_MANIFEST: Array<string | { url: string; revision: string | null }> }

// The app shell, its route chunks and fonts, as built (vite-plugin-pwa writes the list in at build).
precacheAndRoute(self.__WB_MANIFEST)
cleanupOutdatedCaches()

// Pages open from the cached shell. The API, the live socket and downloads are never answered here:
// they always go to the server.
registerRoute(new NavigationRoute(createHandlerBoundToURL('/index.html'), { denylist: [/^\/api\//, /^\/ws/] }))

// A new version waits until the person chooses "Reload" (src/components/layout/UpdatePrompt.vue).
self.addEventListener('message', (event) => {
  if ((event.data as { type?: string } | null)?.type === 'SKIP_WAITING') void self.skipWaiting()
})

const scope: WorkerScope = {
  origin: self.location.origin,
  showNotification: (title, options) => self.registration.showNotification(title, options as NotificationOptions),
  windows: () => self.clients.matchAll({ type: 'window', includeUncontrolled: true }),
  openWindow: (url) => self.clients.openWindow(url),
  fetch: (url, init) => fetch(url, init),
}

/** The payload as JSON, or null when it is not: the notification still shows (see notificationFor). */
function payloadOf(event: PushEvent): unknown {
  try {
    return event.data?.json() ?? null
  } catch {
    return null
  }
}

self.addEventListener('push', (event) => {
  event.waitUntil(onPush(scope, payloadOf(event)))
})

self.addEventListener('notificationclick', (event) => {
  event.notification.close()
  event.waitUntil(onNotificationClick(scope, event.action, event.notification.data as NotificationData | null, event.notification.tag))
})
