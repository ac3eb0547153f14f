import { escapeHtml, factsTable, layout, oneLine } from '../mail'
import { READINGS_ARE_AIDS } from '../mail'
import type { RenderedMail } from '../mail'
import type { BuildReport } from './report-data'
import { buildReportLines } from './report-pdf'

const ACCENT = '#0b6e99'

export function buildReportFileName(report: BuildReport): string {
  const slug =
    report.tank.name
      .toLowerCase()
      .normalize('NFKD')
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')
      .slice(0, 60) || 'tank'
  return `tankwarden-build-${slug}-${report.today}.pdf`
}

/** A short summary of the build with the PDF attached. */
export function buildReportMail(report: BuildReport, pdf: Buffer): RenderedMail {
  const lines = buildReportLines(report)
  const subject = oneLine(`Tankwarden build report: ${report.tank.name}`)
  const lead = `The build report for ${report.tank.name} (${report.tank.siteName}) is attached as a PDF.`
  const facts: Array<[string, string]> = [
    ['Filled on', report.build.filledOn ?? 'not yet'],
    ['Water', lines.water[0] ?? ''],
    ['Steps done', `${report.build.steps.filter((s) => s.doneAt).length} of ${report.build.steps.length}`],
  ]
  return {
    subject,
    text: [lead, '', ...facts.map(([k, v]) => `${k}: ${v}`), '', ...lines.cautions].join('\n'),
    html: layout({
      heading: subject,
      accent: ACCENT,
      footer: READINGS_ARE_AIDS,
      body: [`<p style="margin:0 0 12px">${escapeHtml(lead)}</p>`, factsTable(facts), ...lines.cautions.slice(0, 5).map((c) => `<p>${escapeHtml(c)}</p>`)].join(
        '',
      ),
    }),
    attachments: [{ filename: buildReportFileName(report), contentType: 'application/pdf', base64: pdf.toString('base64') }],
  }
}
