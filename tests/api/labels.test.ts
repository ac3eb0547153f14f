import jsQR from 'jsqr'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { labelsService } from '../../server/labels'
import { qrMatrix, tankLabelLink } from '../../server/labels/qr'
import { labelGrid, MM_TO_PT, type LabelPaper, type LabelSize } from '@shared/labels/sheet'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'
import { pdfPageCount, pdfText } from '../helpers/pdf-text'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let siteId: number
const tanks: Array<{ id: number; name: string }> = []
let archivedId: number

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Label Org')
  siteId = org.siteIds[0]!
  for (const name of ['Reef 1', 'Quarantine B', 'Shrimp rack 3']) {
    const res = await t.api().post('/api/v1/tanks').set(bearer(org.users.owner.token)).send(sampleTank(siteId, { name }))
    tanks.push({ id: res.body.id, name })
  }
  const archived = await t
    .api()
    .post('/api/v1/tanks')
    .set(bearer(org.users.owner.token))
    .send(sampleTank(siteId, { name: 'Old tub' }))
  archivedId = archived.body.id
  await t.api().post(`/api/v1/tanks/${archivedId}/archive`).set(bearer(org.users.owner.token)).send({})
})
afterAll(() => t.close())

const owner = (): UserActor => ({
  kind: 'user',
  userId: org.users.owner.id,
  organizationId: org.organizationId,
  role: 'owner',
  siteIds: null,
  sessionId: 'test',
})

/**
 * Every filled rectangle of an uncompressed label sheet, painted into an RGBA bitmap at `scale`
 * pixels per point (pdfkit flips the page, so y runs down as on screen). The rectangles on a
 * label sheet are the QR modules and nothing else.
 */
function rasterise(pdf: Buffer, page: { width: number; height: number }, scale: number) {
  const width = Math.round(page.width * scale)
  const height = Math.round(page.height * scale)
  const pixels = new Uint8ClampedArray(width * height * 4).fill(255)
  for (const m of pdf.toString('latin1').matchAll(/(-?[\d.]+) (-?[\d.]+) (-?[\d.]+) (-?[\d.]+) re\b/g)) {
    const [x, y, w, h] = m.slice(1, 5).map(Number) as [number, number, number, number]
    for (let py = Math.round(y * scale); py < Math.round((y + h) * scale); py++) {
      for (let px = Math.round(x * scale); px < Math.round((x + w) * scale); px++) pixels.fill(0, (py * width + px) * 4, (py * width + px) * 4 + 3)
    }
  }
  return { pixels, width, height }
}

/** The QR codes of a sheet's first page, read cell by cell with a QR reader (jsQR). */
function decodeSheet(pdf: Buffer, paper: LabelPaper, size: LabelSize, count: number) {
  const pagePt = paper === 'a4' ? { width: 595.28, height: 841.89 } : { width: 612, height: 792 }
  const scale = 3
  const page = rasterise(pdf, pagePt, scale)
  return labelGrid(paper, size)
    .cells.slice(0, count)
    .map((cell) => {
      const [x0, y0] = [Math.round(cell.x * MM_TO_PT * scale), Math.round(cell.y * MM_TO_PT * scale)]
      const [w, h] = [Math.round(cell.width * MM_TO_PT * scale), Math.round(cell.height * MM_TO_PT * scale)]
      const crop = new Uint8ClampedArray(w * h * 4)
      for (let row = 0; row < h; row++) crop.set(page.pixels.subarray(((y0 + row) * page.width + x0) * 4, ((y0 + row) * page.width + x0 + w) * 4), row * w * 4)
      return jsQR(crop, w, h)?.data ?? null
    })
}

describe('tank labels', () => {
  it("prints each live tank's name with a QR code that reads back as its test-kit link, in name order", async () => {
    const sheet = await labelsService(t.ctx).sheet(owner(), siteId, { paper: 'a4', size: 'small' }, { compress: false })
    const byName = [...tanks].sort((a, b) => a.name.localeCompare(b.name))
    const links = byName.map((tank) => tankLabelLink(t.ctx.config.publicUrl, tank.id))
    expect(links[0]).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/tanks\/\d+\/test-kit$/)
    expect(decodeSheet(sheet.pdf, 'a4', 'small', 3)).toEqual(links)
    const text = pdfText(sheet.pdf).join('\n')
    for (const tank of tanks) expect(text).toContain(tank.name)
    expect(text).not.toContain('Old tub')
    // The links are clickable on screen too.
    const uris = [...sheet.pdf.toString('latin1').matchAll(/\/URI \(([^)]*)\)/g)].map((m) => m[1])
    expect(uris).toEqual(links)
    expect(uris.join()).not.toContain(`/tanks/${archivedId}/`)
    expect(sheet.count).toBe(3)
  })

  it('lays large labels two across on US letter', async () => {
    const sheet = await labelsService(t.ctx).sheet(owner(), siteId, { paper: 'letter', size: 'large' }, { compress: false })
    expect(sheet.pdf.toString('latin1')).toMatch(/\/MediaBox \[0 0 612 792\]/)
    const byName = [...tanks].sort((a, b) => a.name.localeCompare(b.name))
    expect(decodeSheet(sheet.pdf, 'letter', 'large', 3)).toEqual(byName.map((tank) => tankLabelLink(t.ctx.config.publicUrl, tank.id)))
    expect(pdfPageCount(sheet.pdf)).toBe(1)
  })

  it("renders the server's QR of a link to pixels that a reader decodes to the same link", () => {
    const link = 'https://tanks.example.org/tanks/4711/test-kit'
    const qr = qrMatrix(link)
    const px = 4
    const side = (qr.size + 8) * px
    const pixels = new Uint8ClampedArray(side * side * 4).fill(255)
    for (let y = 0; y < side; y++) {
      for (let x = 0; x < side; x++) {
        const [row, col] = [Math.floor(y / px) - 4, Math.floor(x / px) - 4]
        if (row >= 0 && col >= 0 && row < qr.size && col < qr.size && qr.dark(row, col)) pixels.fill(0, (y * side + x) * 4, (y * side + x) * 4 + 3)
      }
    }
    expect(jsQR(pixels, side, side)?.data).toBe(link)
  })

  it('answers the route with a PDF attachment; bad paper is a 400 naming the field; other organizations see no site', async () => {
    const res = await t.api().get(`/api/v1/sites/${siteId}/labels.pdf?paper=letter&size=small`).set(bearer(org.users.owner.token))
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('application/pdf')
    expect(res.headers['content-disposition']).toBe('attachment; filename="tank-labels-label-org-shop-letter-small.pdf"')
    const bad = await t.api().get(`/api/v1/sites/${siteId}/labels.pdf?paper=a3`).set(bearer(org.users.owner.token))
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.error.fields)).toEqual(['paper'])
    const other = await t.createOrg('Other label org')
    expect((await t.api().get(`/api/v1/sites/${siteId}/labels.pdf`).set(bearer(other.users.owner.token))).status).toBe(404)
  })
})
