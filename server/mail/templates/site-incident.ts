import type { RenderedMail } from '../types'
import { button, escapeHtml, layout, oneLine } from './html'
import { READINGS_ARE_AIDS } from './safety'
import type { ClockStyle } from '@shared/schemas/auth'
import { formatInZone } from '@shared/time'

export type SiteIncidentMailInput = {
  organizationName: string
  siteName: string
  siteTimeZone: string
  clockStyle?: ClockStyle
  title: string
  severity: 'warning' | 'alarm'
  /** One line per tank: "Reef 2: no temperature reading for 15 min". */
  tanks: string[]
  firstStep: string
  openedAt: string
  incidentsUrl: string
  escalated: boolean
}

const SEVERITY = { warning: 'Warning', alarm: 'Alarm' } as const
const ACCENT = { warning: '#b7791f', alarm: '#b42318' } as const

/** One mail for a fault on several tanks of a site at once, listing the tanks. */
export function siteIncidentMail(i: SiteIncidentMailInput): RenderedMail {
  const count = `${i.tanks.length} tanks`
  const heading = `${i.escalated ? 'Escalated — ' : ''}${SEVERITY[i.severity]}: ${i.title}`
  const subject = oneLine(`${i.escalated ? 'Escalated — ' : ''}${SEVERITY[i.severity]}: ${count} at ${i.siteName} at once`)
  const lead = `${count} of ${i.siteName} tripped within a few minutes of each other on the same kind of cause, from ${formatInZone(i.openedAt, i.siteTimeZone, i.clockStyle)}. Each tank keeps its own incident; this is the one mail for all of them.`
  const footer = `Sent by Tankwarden for ${i.organizationName}. ${READINGS_ARE_AIDS}`
  const html = layout({
    heading,
    accent: ACCENT[i.severity],
    footer,
    body: [
      `<p style="margin:0 0 8px;font-weight:bold">${escapeHtml(i.firstStep)}</p>`,
      `<p style="margin:0 0 8px">${escapeHtml(lead)}</p>`,
      `<ul style="margin:0;padding-left:20px">${i.tanks.map((t) => `<li>${escapeHtml(t)}</li>`).join('')}</ul>`,
      `<p style="margin:16px 0 0">${button('Open the incidents', i.incidentsUrl)}</p>`,
    ].join(''),
  })
  const text = [i.firstStep, '', heading, '', lead, '', ...i.tanks.map((t) => `- ${t}`), '', `Open the incidents: ${i.incidentsUrl}`, '', '-- ', footer].join(
    '\n',
  )
  return { subject, text, html }
}

/** The first thing to do for each kind of site-wide cause (`common practice`). */
export const SITE_FIRST_STEPS: Record<string, string> = {
  power:
    'First: check the site’s power (the fuse board and the supply) before anything else; keep tank lids closed to hold heat. Leave electrical faults to a licensed electrician.',
  heat: 'First: check the room’s temperature and ventilation, and whether heaters are stuck on.',
  water: 'First: stop further water changes and test the tap water and a tank with a test kit.',
  water_level: 'First: look for a leak or a running drain, and switch heaters off at the socket before the water falls below them.',
  light: 'First: check the shared light timer and its power.',
}
