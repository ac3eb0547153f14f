import type { ClockStyle } from '@shared/schemas/auth'
import type { PublicVisit } from '@shared/schemas/visits'
import { button, escapeHtml, factsTable, layout, oneLine, READINGS_ARE_AIDS, type RenderedMail } from '../mail'
import { materialLines, nextLine, readingLine, timeOnSite, visitHeadline } from './report-text'

const ACCENT = '#0b6e99'

export function visitFileName(visit: PublicVisit) {
  return `tankwarden-visit-${visit.id}-${(visit.leftAt ?? visit.startsAt).slice(0, 10)}.pdf`
}

/** The visit report mail: what was done per tank, the readings with their verdicts, what comes next; the PDF attached. */
export function visitReportMail(visit: PublicVisit, pdf: Buffer, link: string, clock: ClockStyle): RenderedMail {
  const subject = oneLine(`Tankwarden visit report: ${visit.clientName}, ${visit.siteName}`)
  const headline = visitHeadline(visit, clock)
  const facts: Array<[string, string]> = [
    ['Technician', visit.technician.name],
    ['On site', timeOnSite(visit, clock)],
    ['Photos', String(visit.photoIds.length)],
    ['Materials', materialLines(visit).join(', ') || 'none recorded'],
  ]
  const tankText = visit.work.flatMap((w) => [
    `${w.tankName}`,
    `  Done: ${w.doneTasks.map((t) => t.title).join(', ') || 'no scheduled tasks'}`,
    `  Readings: ${w.readings.map(readingLine).join('; ') || 'none taken'}`,
    ...(w.notes ? [`  Notes: ${w.notes}`] : []),
    `  Next: ${nextLine(w)}`,
  ])
  const tankHtml = visit.work
    .map(
      (w) =>
        `<h3 style="margin:16px 0 4px">${escapeHtml(w.tankName)}</h3>` +
        factsTable([
          ['Done', w.doneTasks.map((t) => t.title).join(', ') || 'no scheduled tasks'],
          ['Readings', w.readings.map(readingLine).join('; ') || 'none taken'],
          ...(w.notes ? ([['Notes', w.notes]] as Array<[string, string]>) : []),
          ['Next', nextLine(w)],
        ]),
    )
    .join('')
  return {
    subject,
    text: [
      headline,
      '',
      ...facts.map(([k, v]) => `${k}: ${v}`),
      '',
      ...tankText,
      ...(visit.notes ? ['', visit.notes] : []),
      '',
      `Open it in Tankwarden: ${link}`,
      '',
      READINGS_ARE_AIDS,
    ].join('\n'),
    html: layout({
      heading: headline,
      accent: ACCENT,
      footer: READINGS_ARE_AIDS,
      body: [
        factsTable(facts),
        tankHtml,
        visit.notes ? `<p>${escapeHtml(visit.notes)}</p>` : '',
        `<p>The full report is attached as a PDF.</p>`,
        `<p>${button('Open the visit', link)}</p>`,
      ].join(''),
    }),
    attachments: [{ filename: visitFileName(visit), contentType: 'application/pdf', base64: pdf.toString('base64') }],
  }
}
