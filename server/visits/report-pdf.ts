// The visit report as a PDF, with the report fonts and layout of server/reports/.
import type { ClockStyle } from '@shared/schemas/auth'
import type { PublicVisit } from '@shared/schemas/visits'
import type { AppContext } from '../context'
import { READINGS_ARE_AIDS } from '../mail'
import { readPhotoBytes } from '../photos'
import { COLOURS, openDocument, section, write } from '../reports'
import { materialLines, nextLine, readingLine, timeOnSite, visitHeadline } from './report-text'

const THUMB = 120
const MAX_PHOTOS = 8

/** Renders the report of a closed visit on the organisation's clock; `compress: false` keeps the text readable for tests. */
export async function renderVisitPdf(ctx: AppContext, visit: PublicVisit, clock: ClockStyle, options: { compress?: boolean } = {}): Promise<Buffer> {
  const { doc, done } = openDocument(`Tankwarden visit report: ${visit.clientName}`, new Date(visit.closedAt ?? Date.now()), options)
  doc.fillColor(COLOURS.muted)
  write(doc, `Tankwarden visit report · ${visit.clientName}`, 'body', 9)
  doc.fillColor(COLOURS.ink)
  write(doc, visitHeadline(visit, clock), 'bold', 16)
  doc.fillColor(COLOURS.muted)
  write(doc, `${visit.siteAddress || visit.siteName} · technician ${visit.technician.name} · on site ${timeOnSite(visit, clock)}`, 'body', 9)
  doc.moveDown(0.8)
  for (const w of visit.work) {
    doc.fillColor(COLOURS.accent)
    write(doc, w.tankName, 'bold', 13)
    doc.moveDown(0.2)
    section(
      doc,
      'Done',
      w.doneTasks.map((t) => t.title),
      'No scheduled tasks ticked.',
    )
    section(doc, 'Test-kit readings', w.readings.map(readingLine), 'No test-kit readings taken.')
    if (w.notes) section(doc, 'Notes', [w.notes], '')
    section(doc, 'Next', [nextLine(w)], '')
  }
  section(doc, 'Materials used', materialLines(visit), 'None recorded.')
  if (visit.notes) section(doc, 'Notes on the visit', [visit.notes], '')
  write(doc, `Photos: ${visit.photoIds.length}`, 'bold', 11)
  const y = doc.y + 4
  for (const [i, id] of visit.photoIds.slice(0, MAX_PHOTOS).entries()) {
    try {
      const bytes = await readPhotoBytes(ctx, id, 'thumbnail')
      doc.image(bytes, 48 + (i % 4) * (THUMB + 8), y + Math.floor(i / 4) * (THUMB + 8), { fit: [THUMB, THUMB] })
    } catch {
      // A photo removed since the visit closed is counted but not drawn.
    }
  }
  if (visit.photoIds.length) doc.y = y + Math.ceil(Math.min(visit.photoIds.length, MAX_PHOTOS) / 4) * (THUMB + 8)
  doc.moveDown(1)
  doc.fillColor(COLOURS.muted)
  write(doc, READINGS_ARE_AIDS, 'body', 8, { width: 595 - 96 })
  doc.end()
  return done
}
