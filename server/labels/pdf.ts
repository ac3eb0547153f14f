import { labelGrid, MM_TO_PT, placeLabels, type LabelCell, type LabelPaper, type LabelSize } from '@shared/labels/sheet'
import { COLOURS, openDocument, write, type Doc } from '../reports'
import { qrMatrix } from './qr'

export type TankLabel = { name: string; siteName: string; link: string }

const pt = (mm: number) => mm * MM_TO_PT
/** Inner margin of a label: printers and die-cut sheets drift by a millimetre or two (`common practice`). */
const PAD_MM = 3
/** The quiet zone around a QR symbol is 4 modules wide (ISO/IEC 18004). */
const QUIET_MODULES = 4

function drawQr(doc: Doc, link: string, x: number, y: number, side: number) {
  const qr = qrMatrix(link)
  const module = side / (qr.size + 2 * QUIET_MODULES)
  const x0 = x + QUIET_MODULES * module
  const y0 = y + QUIET_MODULES * module
  doc.save().fillColor('#000000')
  for (let row = 0; row < qr.size; row++) {
    for (let col = 0; col < qr.size; col++) if (qr.dark(row, col)) doc.rect(x0 + col * module, y0 + row * module, module, module)
  }
  doc.fill().restore()
  // The same link, clickable when the sheet is opened on a screen.
  doc.link(x, y, side, side, link)
}

function drawLabel(doc: Doc, label: TankLabel, cell: LabelCell) {
  const x = pt(cell.x + PAD_MM)
  const y = pt(cell.y + PAD_MM)
  const height = pt(cell.height - 2 * PAD_MM)
  const width = pt(cell.width - 2 * PAD_MM)
  drawQr(doc, label.link, x, y, height)
  const textX = x + height + pt(1)
  const textWidth = width - height - pt(1)
  const large = cell.height > 50
  doc.fillColor(COLOURS.ink)
  doc.x = textX
  doc.y = y + pt(1)
  write(doc, label.name, 'bold', large ? 14 : 10, { width: textWidth, height: height * 0.6, ellipsis: true })
  doc.fillColor(COLOURS.muted)
  doc.x = textX
  write(doc, label.siteName, 'body', large ? 9 : 7, { width: textWidth, height: pt(8), ellipsis: true })
  doc.x = textX
  write(doc, 'Scan to log a test', 'body', large ? 8 : 6.5, { width: textWidth })
}

/** The sheet: labels in name order, as many pages as they need; `compress: false` keeps text readable for tests. */
export async function renderLabelsPdf(
  labels: TankLabel[],
  options: { paper: LabelPaper; size: LabelSize; title: string; compress?: boolean },
): Promise<Buffer> {
  const { doc, done } = openDocument(options.title, new Date(), { compress: options.compress, size: options.paper === 'a4' ? 'A4' : 'LETTER', margin: 0 })
  const grid = labelGrid(options.paper, options.size)
  if (!labels.length) {
    doc.x = pt(20)
    doc.y = pt(20)
    write(doc, 'This site has no tanks to label yet.', 'body', 12)
  }
  let page = 0
  for (const { page: p, cell, item } of placeLabels(labels, grid)) {
    if (p !== page) {
      doc.addPage()
      page = p
    }
    drawLabel(doc, item, cell)
  }
  doc.end()
  return done
}
