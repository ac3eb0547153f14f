import type { RenderedMail } from '../types'
import { button, escapeHtml, layout, oneLine, safeUrl } from './html'

const ACCENT = '#0b6e99'

export type InvitationInput = { organizationName: string; inviterName: string; link: string; validHours?: number }

export function invitation(i: InvitationInput): RenderedMail {
  const lead = `${i.inviterName} invites you to join ${i.organizationName} on Tankwarden, where the team watches its tanks, duty roster and care work.`
  const validity = i.validHours ? `The link works for ${i.validHours} hours and only once.` : 'The link works only once.'
  const ignore = 'If you did not expect this invitation, ignore this mail: nothing happens without the link.'
  return {
    subject: oneLine(`${i.inviterName} invites you to ${i.organizationName} on Tankwarden`),
    text: [lead, '', `Accept the invitation: ${safeUrl(i.link)}`, '', validity, ignore].join('\n'),
    html: layout({
      heading: `Join ${i.organizationName}`,
      accent: ACCENT,
      footer: ignore,
      body: [
        `<p style="margin:0 0 12px">${escapeHtml(lead)}</p>`,
        `<p>${button('Accept the invitation', i.link)}</p>`,
        `<p style="color:#52606d">${escapeHtml(validity)}</p>`,
      ].join(''),
    }),
  }
}

export type PasswordResetInput = { link: string; validMinutes?: number }

export function passwordReset(i: PasswordResetInput): RenderedMail {
  const lead = 'Someone asked to reset the password of your Tankwarden account. Choose a new password with the link below.'
  const validity = i.validMinutes ? `The link works for ${i.validMinutes} minutes and only once.` : 'The link works only once.'
  const ignore = 'If you did not ask for this, ignore this mail: your password stays as it is.'
  return {
    subject: 'Reset your Tankwarden password',
    text: [lead, '', `Choose a new password: ${safeUrl(i.link)}`, '', validity, ignore].join('\n'),
    html: layout({
      heading: 'Reset your password',
      accent: ACCENT,
      footer: ignore,
      body: [
        `<p style="margin:0 0 12px">${escapeHtml(lead)}</p>`,
        `<p>${button('Choose a new password', i.link)}</p>`,
        `<p style="color:#52606d">${escapeHtml(validity)}</p>`,
      ].join(''),
    }),
  }
}
