import { formatPercent, formatSpan } from '@shared/report/format'
import type { Report } from '@shared/schemas/reports'
import { button, escapeHtml, factsTable, layout, oneLine } from '../mail'
import { READINGS_ARE_AIDS } from '../mail'
import type { RenderedMail } from '../mail'

const ACCENT = '#0b6e99'

/** A file name that is safe anywhere: the subject's name reduced to letters, digits and dashes. */
export function reportFileName(report: Report): string {
  const slug =
    report.subject.name
      .toLowerCase()
      .normalize('NFKD')
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')
      .slice(0, 60) || report.subject.kind
  return `tankwarden-report-${slug}-${report.period.kind}-${report.period.startDate}.pdf`
}

/** One line per tank: time in band of each metric, incidents, care, water. */
function tankLines(report: Report): Array<[string, string]> {
  return report.tanks.map((t) => {
    const bands = t.metrics.map((m) => `${m.label} in band ${formatPercent(m.timeInBandPercent)}`).join(', ')
    const care = t.care.due || t.care.done ? `care ${t.care.done}/${t.care.due}` : 'no care due'
    return [t.name, `${bands}; ${t.incidentSummary.opened} incident(s); ${care}; ${t.water.litres.toFixed(0)} L water changed`]
  })
}

/** The periodic report mail: a short summary, a link to the report screen, the PDF attached. */
export function reportMail(report: Report, pdf: Buffer, link: string): RenderedMail {
  const subject = oneLine(`Tankwarden report: ${report.subject.name}, ${report.period.label}`)
  const lines = tankLines(report)
  const incidents = report.tanks.flatMap((t) => t.incidents)
  const acks = incidents.map((i) => i.timeToAcknowledgeMs).filter((v): v is number => v !== null)
  const ackNote = acks.length ? `Incidents were acknowledged after ${formatSpan(acks.reduce((a, b) => a + b, 0) / acks.length)} on average.` : ''
  const lead = `The ${report.period.kind === 'week' ? 'weekly' : 'monthly'} report for ${report.subject.name} (${report.subject.siteName}), ${report.period.label}, is attached as a PDF.`
  return {
    subject,
    text: [
      lead,
      '',
      ...lines.map(([name, value]) => `${name}: ${value}`),
      ...(ackNote ? ['', ackNote] : []),
      '',
      `Open it in Tankwarden: ${link}`,
      '',
      READINGS_ARE_AIDS,
    ].join('\n'),
    html: layout({
      heading: subject,
      accent: ACCENT,
      footer: READINGS_ARE_AIDS,
      body: [
        `<p style="margin:0 0 12px">${escapeHtml(lead)}</p>`,
        lines.length ? factsTable(lines) : `<p>${escapeHtml('No tanks to report on.')}</p>`,
        ackNote ? `<p>${escapeHtml(ackNote)}</p>` : '',
        `<p>${button('Open the report', link)}</p>`,
      ].join(''),
    }),
    attachments: [{ filename: reportFileName(report), contentType: 'application/pdf', base64: pdf.toString('base64') }],
  }
}
