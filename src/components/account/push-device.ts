import type { PushSubscriptionBody } from '@shared/schemas/push'

/** Where this browser stands with notifications, in the words the Account page shows. */
export type PushSupport = 'ready' | 'unsupported' | 'denied'

const REMEMBERED = 'tankwarden.pushDeviceId'

export function pushSupport(): PushSupport {
  if (!('serviceWorker' in navigator) || !('PushManager' in window) || !('Notification' in window)) return 'unsupported'
  return Notification.permission === 'denied' ? 'denied' : 'ready'
}

/** "Android phone, Chrome": enough for a person to tell their devices apart. */
export function deviceLabel(agent = navigator.userAgent): string {
  const device = /iPhone/.test(agent)
    ? 'iPhone'
    : /iPad/.test(agent)
      ? 'iPad'
      : /Android/.test(agent)
        ? /Mobile/.test(agent)
          ? 'Android phone'
          : 'Android tablet'
        : /Windows/.test(agent)
          ? 'Windows computer'
          : /Macintosh/.test(agent)
            ? 'Mac'
            : /Linux|CrOS/.test(agent)
              ? 'Linux computer'
              : 'Device'
  const browser = /Edg\//.test(agent)
    ? 'Edge'
    : /Firefox\//.test(agent)
      ? 'Firefox'
      : /Chrome\/|CriOS\//.test(agent)
        ? 'Chrome'
        : /Safari\//.test(agent)
          ? 'Safari'
          : ''
  return browser ? `${device}, ${browser}` : device
}

function keyBytes(base64url: string): Uint8Array<ArrayBuffer> {
  const raw = atob(base64url.replace(/-/g, '+').replace(/_/g, '/'))
  return Uint8Array.from(raw, (c) => c.charCodeAt(0))
}

/** The app's service worker, once it runs; it registers after the page has loaded. */
async function workerRegistration(timeoutMs = 10_000): Promise<ServiceWorkerRegistration> {
  const timeout = new Promise<never>((_, reject) =>
    setTimeout(() => reject(new Error('The app is not installed in this browser yet: reload the page and try again')), timeoutMs),
  )
  return Promise.race([navigator.serviceWorker.ready, timeout])
}

/**
 * Asks for permission (it must follow a tap), subscribes this browser with the server's VAPID key
 * and answers what the server needs. Null when the person said no.
 */
export async function subscribeThisBrowser(publicKey: string): Promise<PushSubscriptionBody | null> {
  if ((await Notification.requestPermission()) !== 'granted') return null
  const registration = await workerRegistration()
  const existing = await registration.pushManager.getSubscription()
  const subscription =
    existing ??
    (await registration.pushManager.subscribe({ userVisibleOnly: true, applicationServerKey: keyBytes(publicKey) }).catch((error: unknown) => {
      // The browser's own push service refused or could not be reached (offline, or a browser without one).
      throw new Error(
        `This browser could not sign up with its push service (${error instanceof Error ? error.message : String(error)}). Try again when online.`,
      )
    }))
  const json = subscription.toJSON()
  return { endpoint: json.endpoint ?? subscription.endpoint, keys: { p256dh: json.keys?.p256dh ?? '', auth: json.keys?.auth ?? '' }, label: deviceLabel() }
}

/** Which listed device is this browser: remembered when it was enabled here. */
export const rememberedDeviceId = () => Number(localStorage.getItem(REMEMBERED)) || null
export const rememberDevice = (id: number | null) => (id ? localStorage.setItem(REMEMBERED, String(id)) : localStorage.removeItem(REMEMBERED))

/**
 * Signing out stops this browser's alerts: the next person on a shared phone must not see them.
 * Best effort (offline, no worker): the device stays on the Account page to remove by hand then.
 */
export async function forgetThisBrowser(remove: (id: number) => Promise<void>): Promise<void> {
  const id = rememberedDeviceId()
  if (!id) return
  rememberDevice(null)
  await remove(id).catch(() => undefined)
  const registration = 'serviceWorker' in navigator ? await navigator.serviceWorker.getRegistration().catch(() => undefined) : undefined
  await (await registration?.pushManager.getSubscription().catch(() => null))?.unsubscribe().catch(() => false)
}
