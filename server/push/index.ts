import type { AppContext } from '../context'
import { startPushSender, type PushSender, type PushSenderOptions } from './sender'
import { vapidKeysFor } from './vapid'

// What other features may use of push/; everything else in the folder is its own.
export { enqueuePush, pushedUserIds, type OutgoingPush } from './outbox'
export { alertChannelsOf, incidentPush, pushAlert, sitePush, toldWord, type IncidentPushInput, type IncidentPushKind } from './alerts'
export { startPushSender, type PushSender, type PushSenderOptions, type PushRunResult } from './sender'
export { vapidKeysFor } from './vapid'

/**
 * Makes sure the instance has its VAPID key pair (made into the data folder on the very first
 * start), then starts its push outbox sender (every instance may run one; each row goes to one).
 */
export function startPush(ctx: AppContext, options: PushSenderOptions = {}): PushSender {
  vapidKeysFor(ctx)
  return startPushSender(ctx, options)
}
