import type { OutboxAttachment, RenderedMail } from '../types'
import { button, cautionBox, escapeHtml, factsTable, layout, oneLine, safeUrl } from './html'
import { READINGS_ARE_AIDS } from './safety'
import type { ClockStyle } from '@shared/schemas/auth'
import { formatDuration, formatInZone } from '@shared/time'

export type IncidentMailInput = {
  organizationName: string
  siteName: string
  tankName: string
  ruleName: string
  severity: 'warning' | 'alarm'
  metricLabel: string
  /** A number is shown with at most two decimals; pass a string to control the precision. */
  value: number | string
  unitLabel: string
  /** ISO time the incident opened (for device-back: since when the tank was quiet). */
  since: string
  siteTimeZone: string
  /** The organisation's clock: "14:05" or "2:05 pm"; 24-hour unless given. */
  clockStyle?: ClockStyle
  whatToCheck: string[]
  incidentUrl: string
  acknowledgeUrl?: string
  trendPng?: Buffer
  safetyCaution?: string
  /** ISO time of this mail's event (escalated, repeated, resolved, back); shown with how long it lasted. */
  at?: string
  /** What was measured, in words: "no temperature reading for 15 min" (shared/rules/measurement). */
  measurement?: string
  /** The first line of an actionable mail: what to do first. */
  firstStep?: string
  /** "Heater installed 2 years 3 months ago", for a temperature incident on a tank with a recorded heater. */
  heater?: string
  /** A line about why this mail comes now (a flap that held, a severity that rose, a window that ended). */
  note?: string
}

export const TREND_CID = 'trend@tankwarden'

type Variant = {
  heading: (i: IncidentMailInput) => string
  subject: (i: IncidentMailInput) => string
  lead: (i: IncidentMailInput) => string
  sinceLabel: string
  accent: (i: IncidentMailInput) => string
  /** Still something to do: what to check, the caution and the acknowledge link. */
  actionable: boolean
}

const SEVERITY = { warning: 'Warning', alarm: 'Alarm' } as const
const ACCENT = { warning: '#b7791f', alarm: '#b42318' } as const
const CALM = '#2f855a'

const reading = (i: IncidentMailInput) => {
  const value = typeof i.value === 'number' ? new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 }).format(i.value) : i.value
  return oneLine(`${value} ${i.unitLabel}`)
}
const where = (i: IncidentMailInput) => `${i.tankName} · ${i.siteName}`
/** "no temperature reading for 15 min" when the measurement is known, else "Temperature 31.46 °C". */
const what = (i: IncidentMailInput) => (i.measurement ? oneLine(i.measurement) : `${i.metricLabel} ${reading(i)}`)
const lasted = (i: IncidentMailInput) => (i.at ? ` (${formatDuration(Date.parse(i.at) - Date.parse(i.since))})` : '')

const VARIANTS = {
  opened: {
    heading: (i) => `${SEVERITY[i.severity]}: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `${SEVERITY[i.severity]}: ${what(i)} on ${where(i)}`,
    lead: (i) =>
      i.measurement
        ? `The watch rule "${i.ruleName}" opened an incident: ${what(i)}.`
        : `The watch rule "${i.ruleName}" opened an incident: ${i.metricLabel} is ${reading(i)}.`,
    sinceLabel: 'Opened',
    accent: (i) => ACCENT[i.severity],
    actionable: true,
  },
  escalated: {
    heading: (i) => `Escalated ${SEVERITY[i.severity].toLowerCase()}: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `Escalated ${SEVERITY[i.severity].toLowerCase()}: nobody has acknowledged ${i.metricLabel} on ${where(i)}`,
    lead: (i) => `Nobody has acknowledged this incident yet${lasted(i)}, so it now comes to you. ${i.metricLabel} is ${reading(i)}.`,
    sinceLabel: 'Opened',
    accent: (i) => ACCENT[i.severity],
    actionable: true,
  },
  repeat: {
    heading: (i) => `Still open: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `Still open — ${SEVERITY[i.severity].toLowerCase()}: ${what(i)} on ${where(i)}`,
    lead: (i) => `This incident is still open${lasted(i)}. ${i.metricLabel} is ${reading(i)}.`,
    sinceLabel: 'Opened',
    accent: (i) => ACCENT[i.severity],
    actionable: true,
  },
  resolved: {
    heading: (i) => `Resolved: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `Resolved: ${i.metricLabel} on ${where(i)} is back in range`,
    lead: (i) => `The incident of "${i.ruleName}" is resolved${lasted(i)}: ${i.metricLabel} is ${reading(i)}.`,
    sinceLabel: 'Opened',
    accent: () => CALM,
    actionable: false,
  },
  raised: {
    heading: (i) => `Now ${SEVERITY[i.severity].toLowerCase()}: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `Now ${SEVERITY[i.severity].toLowerCase()}: ${what(i)} on ${where(i)}`,
    lead: (i) => `The same incident got worse: ${what(i)} ("${i.ruleName}").`,
    sinceLabel: 'Opened',
    accent: (i) => ACCENT[i.severity],
    actionable: true,
  },
  reopened: {
    heading: (i) => `Back and holding: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `Back and holding — ${SEVERITY[i.severity].toLowerCase()}: ${what(i)} on ${where(i)}`,
    lead: (i) => `It cleared, came back within its settle window and still holds: ${what(i)}.`,
    sinceLabel: 'Opened',
    accent: (i) => ACCENT[i.severity],
    actionable: true,
  },
  resolver: {
    heading: (i) => `Reopened: ${i.metricLabel} on ${i.tankName}`,
    subject: (i) => `Reopened after you resolved it: ${what(i)} on ${where(i)}`,
    lead: (i) => `You resolved this incident, but its condition still holds, so it is open again: ${what(i)}.`,
    sinceLabel: 'Opened',
    accent: (i) => ACCENT[i.severity],
    actionable: true,
  },
  deviceBack: {
    heading: (i) => `Reporting again: ${i.tankName}`,
    subject: (i) => `Reporting again: ${where(i)}`,
    lead: (i) => `Readings arrive again after a quiet spell${lasted(i)}. Latest ${i.metricLabel}: ${reading(i)}.`,
    sinceLabel: 'Quiet since',
    accent: () => CALM,
    actionable: false,
  },
} satisfies Record<string, Variant>

function render(variant: Variant, i: IncidentMailInput): RenderedMail {
  const sinceText = formatInZone(i.since, i.siteTimeZone, i.clockStyle)
  const facts: Array<[string, string]> = [
    ['Organization', i.organizationName],
    ['Site', i.siteName],
    ['Tank', i.tankName],
    ['Watch rule', i.ruleName],
    ['Severity', SEVERITY[i.severity]],
    i.measurement ? ['Measured', oneLine(i.measurement)] : [i.metricLabel, reading(i)],
    [variant.sinceLabel, sinceText],
    ...(i.at ? ([['This update', formatInZone(i.at, i.siteTimeZone, i.clockStyle)]] as Array<[string, string]>) : []),
    ...(i.heater ? ([['Equipment', i.heater]] as Array<[string, string]>) : []),
  ]
  const checks = variant.actionable ? i.whatToCheck : []
  const first = variant.actionable && i.firstStep ? oneLine(i.firstStep) : undefined
  const lead = [variant.lead(i), i.note].filter(Boolean).join(' ')
  const caution = variant.actionable ? i.safetyCaution : undefined
  const ack = variant.actionable ? i.acknowledgeUrl : undefined
  const attachments: OutboxAttachment[] = i.trendPng
    ? [{ filename: 'trend.png', cid: TREND_CID, contentType: 'image/png', base64: i.trendPng.toString('base64') }]
    : []
  const footer = `Sent by Tankwarden for ${i.organizationName}. ${READINGS_ARE_AIDS}`

  const html = layout({
    heading: variant.heading(i),
    accent: variant.accent(i),
    footer,
    body: [
      first ? `<p style="margin:0 0 8px;font-weight:bold">${escapeHtml(first)}</p>` : '',
      `<p style="margin:0 0 8px">${escapeHtml(lead)}</p>`,
      factsTable(facts),
      i.trendPng
        ? `<img src="cid:${TREND_CID}" width="600" height="240" alt="${escapeHtml(`Recent ${i.metricLabel} on ${i.tankName}`)}" style="max-width:100%;height:auto;border:1px solid #e4e7eb">`
        : '',
      checks.length
        ? `<p style="margin:16px 0 4px;font-weight:bold">What to check</p><ul style="margin:0;padding-left:20px">${checks.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul>`
        : '',
      caution ? cautionBox(caution) : '',
      `<p style="margin:16px 0 0">${ack ? button('Acknowledge', ack, ACCENT[i.severity]) : ''}${button('Open the incident', i.incidentUrl)}</p>`,
    ].join(''),
  })

  const text = [
    // What to do first is the first line a person reads, before any heading.
    ...(first ? [first, ''] : []),
    variant.heading(i),
    '',
    lead,
    '',
    ...facts.map(([label, value]) => `${label}: ${value}`),
    ...(checks.length ? ['', 'What to check:', ...checks.map((c) => `- ${c}`)] : []),
    ...(caution ? ['', `SAFETY: ${caution}`] : []),
    '',
    ...(ack ? [`Acknowledge: ${safeUrl(ack)}`] : []),
    `Open the incident: ${safeUrl(i.incidentUrl)}`,
    '',
    '-- ',
    footer,
  ].join('\n')

  return { subject: oneLine(variant.subject(i)), text, html, ...(attachments.length ? { attachments } : {}) }
}

export const incidentOpened = (input: IncidentMailInput) => render(VARIANTS.opened, input)
export const incidentEscalated = (input: IncidentMailInput) => render(VARIANTS.escalated, input)
export const incidentRepeat = (input: IncidentMailInput) => render(VARIANTS.repeat, input)
export const incidentResolved = (input: IncidentMailInput) => render(VARIANTS.resolved, input)
export const incidentRaised = (input: IncidentMailInput) => render(VARIANTS.raised, input)
export const incidentReopened = (input: IncidentMailInput) => render(VARIANTS.reopened, input)
export const incidentReopenedToResolver = (input: IncidentMailInput) => render(VARIANTS.resolver, input)
export const deviceBack = (input: IncidentMailInput) => render(VARIANTS.deviceBack, input)
