/** Every kind of mail the product sends; the mail_outbox CHECK constraint lists the same. */
export const MAIL_KINDS = [
  'incident_opened',
  'incident_escalated',
  'incident_repeat',
  'incident_resolved',
  'device_back',
  'invitation',
  'password_reset',
  'care_digest',
  'report',
  'snooze_ending',
  'incident_raised',
  'incident_reopened',
  'site_incident_opened',
  'site_incident_escalated',
  'visit_report',
] as const
export type MailKind = (typeof MAIL_KINDS)[number]

export type MailStatus = 'pending' | 'sending' | 'sent' | 'failed'

/** A file sent with a mail; `cid` makes it addressable from the HTML as `cid:<cid>`. */
export type OutboxAttachment = { filename: string; cid?: string; contentType: string; base64: string }

/** What a template renders. */
export type RenderedMail = { subject: string; text: string; html: string; attachments?: OutboxAttachment[] }

/** What fake_mailbox keeps of an attachment (the content itself is not stored). */
export type ReceivedAttachment = { filename: string | null; contentType: string; size: number; cid: string | null }
