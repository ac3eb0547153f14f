// The client report as a PDF: pdfkit (pure JS), an embedded font, vector charts with the band shaded.
import { createRequire } from 'node:module'
import PDFDocument from 'pdfkit'
import { formatBand, formatPercent, formatSpan, formatValue, metricSummary } from '@shared/report/format'
import { formatDateTime as moment, formatDay as dayLabel } from '@shared/time'
import type { Report, ReportMetric, TankReport } from '@shared/schemas/reports'
import { READINGS_ARE_AIDS } from '../mail'
import { REPORT_MAX_GAP_MS } from './report-data'

const require = createRequire(import.meta.url)
// Roboto's Latin subset has °, µ and the dashes; its maths subset has ≤ and ≥.
const FONTS = {
  body: require.resolve('@fontsource/roboto/files/roboto-latin-400-normal.woff'),
  bold: require.resolve('@fontsource/roboto/files/roboto-latin-700-normal.woff'),
  math: require.resolve('@fontsource/roboto/files/roboto-math-400-normal.woff'),
}
const MATH_CHARS = /([≤≥])/

export const COLOURS = { ink: '#1f2933', muted: '#52606d', line: '#0b6e99', band: '#d8f0e3', grid: '#d9e2ec', accent: '#0b6e99' }
const MARGIN = 48
const PAGE_BOTTOM = 842 - MARGIN

export type Doc = InstanceType<typeof PDFDocument>

/** Writes text, switching to the maths font for ≤ and ≥ within the line. */
export function write(doc: Doc, text: string, font: 'body' | 'bold', size: number, options: PDFKit.Mixins.TextOptions = {}) {
  const parts = text.split(MATH_CHARS).filter((p) => p.length)
  doc.fontSize(size)
  parts.forEach((part, i) => {
    doc.font(MATH_CHARS.test(part) ? 'math' : font).text(part, { ...options, continued: i < parts.length - 1 })
  })
}

export function ensureRoom(doc: Doc, height: number) {
  if (doc.y + height > PAGE_BOTTOM) doc.addPage()
}

/** A line chart of the period: band shaded, the line broken at gaps, min and max of the axis labelled. */
function chart(doc: Doc, m: ReportMetric, report: Report) {
  const width = 595 - 2 * MARGIN
  const height = 110
  ensureRoom(doc, height + 40)
  const x0 = MARGIN
  const y0 = doc.y
  const from = Date.parse(report.period.from)
  const to = Date.parse(report.period.to)
  const values = m.series.map(([, v]) => v).filter((v): v is number => v !== null)
  const limits = [m.band?.min, m.band?.max].filter((v): v is number => typeof v === 'number')
  let lo = Math.min(...values, ...limits)
  let hi = Math.max(...values, ...limits)
  if (!Number.isFinite(lo)) [lo, hi] = [0, 1]
  if (hi - lo < 1e-9) [lo, hi] = [lo - 0.5, hi + 0.5]
  const pad = (hi - lo) * 0.08
  lo -= pad
  hi += pad
  const px = (t: number) => x0 + ((t - from) / (to - from)) * width
  const py = (v: number) => y0 + height - ((v - lo) / (hi - lo)) * height

  doc.save()
  doc.rect(x0, y0, width, height).fillColor('#ffffff').strokeColor(COLOURS.grid).lineWidth(0.5).fillAndStroke()
  if (m.band && (m.band.min !== null || m.band.max !== null)) {
    const top = py(Math.min(hi, m.band.max ?? hi))
    const bottom = py(Math.max(lo, m.band.min ?? lo))
    doc
      .rect(x0, top, width, bottom - top)
      .fillColor(COLOURS.band)
      .fill()
  }
  // Day boundaries every 24 h from the start (a month gets one every 7 days).
  const step = report.period.kind === 'week' ? 86_400_000 : 7 * 86_400_000
  doc.fontSize(7).font('body').fillColor(COLOURS.muted)
  for (let t = from; t < to; t += step) {
    doc
      .moveTo(px(t), y0)
      .lineTo(px(t), y0 + height)
      .strokeColor(COLOURS.grid)
      .lineWidth(0.4)
      .stroke()
    doc.text(dayLabel(t, report.subject.timeZone), px(t) + 2, y0 + height + 2, { lineBreak: false })
  }
  let drawing = false
  for (const [t, v] of m.series) {
    if (v === null) {
      drawing = false
      continue
    }
    if (drawing) doc.lineTo(px(t), py(v))
    else doc.moveTo(px(t), py(v))
    drawing = true
  }
  doc.strokeColor(COLOURS.line).lineWidth(1).stroke()
  doc.fillColor(COLOURS.muted).fontSize(7)
  doc.text(formatValue(m, hi), x0 + 2, y0 + 2, { lineBreak: false })
  doc.text(formatValue(m, lo), x0 + 2, y0 + height - 10, { lineBreak: false })
  doc.restore()
  doc.x = MARGIN
  doc.y = y0 + height + 14
}

function metricBlock(doc: Doc, m: ReportMetric, report: Report) {
  ensureRoom(doc, 170)
  doc.fillColor(COLOURS.ink)
  write(doc, `${m.label} — target ${formatBand(m)}`, 'bold', 11)
  doc.moveDown(0.2)
  chart(doc, m, report)
  doc.fillColor(COLOURS.ink)
  write(doc, metricSummary(m), 'body', 9)
  if (m.gaps.length) {
    const listed = m.gaps
      .slice(0, 4)
      .map(
        (g) => `${moment(g.from, report.subject.timeZone, report.subject.clockStyle)} to ${moment(g.to, report.subject.timeZone, report.subject.clockStyle)}`,
      )
    doc.fillColor(COLOURS.muted)
    write(doc, `No readings: ${listed.join('; ')}${m.gaps.length > 4 ? `; and ${m.gaps.length - 4} more` : ''}`, 'body', 8)
  }
  doc.moveDown(0.6)
}

export function section(doc: Doc, title: string, lines: string[], empty: string) {
  ensureRoom(doc, 30 + Math.min(lines.length, 3) * 11)
  doc.fillColor(COLOURS.ink)
  write(doc, title, 'bold', 11)
  doc.fillColor(COLOURS.ink)
  if (!lines.length) write(doc, empty, 'body', 9)
  for (const line of lines) {
    ensureRoom(doc, 12)
    write(doc, line, 'body', 9)
  }
  doc.moveDown(0.6)
}

const MAX_LINES = 12
const capped = (lines: string[]) => (lines.length > MAX_LINES ? [...lines.slice(0, MAX_LINES), `… and ${lines.length - MAX_LINES} more`] : lines)

function tankPages(doc: Doc, tank: TankReport, report: Report) {
  const zone = report.subject.timeZone
  doc.fillColor(COLOURS.accent)
  write(doc, tank.name, 'bold', 15)
  doc.fillColor(COLOURS.muted)
  write(doc, `${tank.volumeLitres.toFixed(0)} L`, 'body', 9)
  doc.moveDown(0.5)
  for (const m of tank.metrics) metricBlock(doc, m, report)

  const s = tank.incidentSummary
  const incidentLines = tank.incidents.map(
    (i) =>
      `${moment(i.openedAt, zone, report.subject.clockStyle)} · ${i.severity} · ${i.title} · acknowledged after ${formatSpan(i.timeToAcknowledgeMs)} · ${i.resolvedAt ? `resolved after ${formatSpan(i.timeToResolveMs)}` : 'still open'}`,
  )
  const incidentHead = s.opened
    ? [
        `${s.opened} opened, ${s.stillOpen} still open · mean time to acknowledge ${formatSpan(s.meanTimeToAcknowledgeMs)} · to resolve ${formatSpan(s.meanTimeToResolveMs)}`,
      ]
    : []
  section(doc, 'Incidents', [...incidentHead, ...capped(incidentLines)], 'No incidents opened in this period.')

  const careHead = tank.care.tasks.length ? [`${tank.care.done} done of ${tank.care.due} due`] : []
  section(doc, 'Care tasks', [...careHead, ...capped(tank.care.tasks.map((t) => `${t.title}: done ${t.done} of ${t.due} due`))], 'No care tasks scheduled.')
  section(
    doc,
    'Water changes',
    tank.water.changes
      ? [
          `${tank.water.litres.toFixed(1)} L changed in ${tank.water.changes} water change${tank.water.changes === 1 ? '' : 's'} (${formatPercent((tank.water.litres / tank.volumeLitres) * 100)} of the tank volume in total)`,
        ]
      : [],
    'No water changes recorded.',
  )
  const stock = tank.livestock
  const stockHead = stock.changes.length ? [`added ${stock.added} · removed ${stock.removed} · lost ${stock.lost}`] : []
  section(
    doc,
    'Livestock',
    [...stockHead, ...capped(stock.changes.map((c) => `${moment(c.at, zone, report.subject.clockStyle)} · ${c.text}`))],
    'No livestock changes.',
  )
  section(doc, 'Photos', capped(tank.photos.map((p) => `${moment(p.takenAt, zone, report.subject.clockStyle)} · ${p.caption}`)), 'No photos in this period.')
}

/** An A4 document with the report fonts; `done` resolves to the bytes once `doc.end()` is called. */
export function openDocument(title: string, createdAt: Date, options: { compress?: boolean; size?: 'A4' | 'LETTER'; margin?: number } = {}) {
  const doc = new PDFDocument({
    size: options.size ?? 'A4',
    margin: options.margin ?? MARGIN,
    compress: options.compress ?? true,
    info: { Title: title, Author: 'Tankwarden', CreationDate: createdAt },
  })
  doc.registerFont('body', FONTS.body)
  doc.registerFont('bold', FONTS.bold)
  doc.registerFont('math', FONTS.math)
  const chunks: Buffer[] = []
  doc.on('data', (chunk: Buffer) => chunks.push(chunk))
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  return { doc, done }
}

/** Renders the report; `compress: false` keeps content streams readable (tests look for text). */
export async function renderReportPdf(report: Report, options: { compress?: boolean } = {}): Promise<Buffer> {
  const { doc, done } = openDocument(`Tankwarden report: ${report.subject.name}, ${report.period.label}`, new Date(report.generatedAt), options)

  const zone = report.subject.timeZone
  report.tanks.forEach((tank, i) => {
    if (i > 0) doc.addPage()
    doc.fillColor(COLOURS.muted)
    write(doc, `Tankwarden report · ${report.subject.kind !== 'tank' ? report.subject.name : `${report.subject.siteName}`}`, 'body', 9)
    doc.fillColor(COLOURS.ink)
    write(doc, report.period.label, 'bold', 13)
    doc.fillColor(COLOURS.muted)
    write(
      doc,
      `Times in ${zone}${report.period.inProgress ? ` · period still running, figures up to ${moment(report.generatedAt, zone, report.subject.clockStyle)}` : ''}`,
      'body',
      8,
    )
    doc.moveDown(0.6)
    tankPages(doc, tank, report)
  })
  if (!report.tanks.length) write(doc, `${report.subject.name}: no tanks to report on.`, 'body', 11)
  doc.moveDown(0.4)
  ensureRoom(doc, 40)
  doc.fillColor(COLOURS.muted)
  write(
    doc,
    `Time in band counts only time covered by readings; a stretch of more than three usual reading intervals (at most ${formatSpan(REPORT_MAX_GAP_MS)}) without a reading is a gap and counts nowhere. ${READINGS_ARE_AIDS}`,
    'body',
    7.5,
  )
  doc.end()
  return done
}
