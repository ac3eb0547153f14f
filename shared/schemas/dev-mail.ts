// The local test mailbox (development only): what the fake SMTP server kept.

export interface MailSummary {
  id: number
  receivedAt: string
  organizationId: number | null
  envelopeFrom: string
  envelopeTo: string[]
  subject: string
  attachments: Array<{ filename?: string; contentType?: string; size?: number }> | null
  rawSize: number
}

export interface MailMessage extends MailSummary {
  textBody: string | null
  htmlBody: string | null
  headers: Record<string, string>
}
