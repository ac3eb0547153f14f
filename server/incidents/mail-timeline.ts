import type { AppContext } from '../context'
import type { EventMap } from '../platform/events'

type Attempt = EventMap['mail.attempted'][0]

/** Each delivery attempt of an incident's mail goes into the incident's timeline, with its result. */
export function recordMailAttempts(ctx: AppContext) {
  const onAttempt = (a: Attempt) => {
    if (!a.incidentId) return
    ctx.models.IncidentEvent.create({
      incidentId: a.incidentId,
      kind: a.ok ? 'mail_sent' : 'mail_failed',
      detail: { to: a.to, mail: a.kind, outboxId: a.outboxId, ...(a.error ? { error: a.error } : {}) },
    }).catch((error) => ctx.logger.warn({ err: error }, 'could not record a mail attempt on its incident'))
  }
  ctx.events.on('mail.attempted', onAttempt)
  return () => ctx.events.off('mail.attempted', onAttempt)
}
