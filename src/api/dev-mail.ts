import type { MailMessage, MailSummary } from '@shared/schemas/dev-mail'
import { ApiError } from './errors'
import { http } from './client'

/** The local test mailbox exists only while the development mail server runs; `null` when it does not. */
export async function listMail(): Promise<MailSummary[] | null> {
  try {
    const body = (await http.get<{ items?: unknown }>('/dev/mail')).data
    // Anything but the mailbox's own answer (an HTML page from a proxy, say) means there is none here.
    return Array.isArray(body?.items) ? (body.items as MailSummary[]) : null
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) return null
    throw error
  }
}

export async function getMail(id: number): Promise<MailMessage> {
  return (await http.get<MailMessage>(`/dev/mail/${id}`)).data
}

export async function emptyMailbox(): Promise<void> {
  await http.delete('/dev/mail')
}
