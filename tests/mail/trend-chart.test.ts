import sharp from 'sharp'
import { describe, expect, it } from 'vitest'
import { renderTrendPng, renderTrendSvg } from '../../server/mail/trend-chart'

// PNG signature and IHDR layout: W3C, "Portable Network Graphics (PNG) Specification (Second
// Edition)", 2003, section 5.2 "PNG signature" (bytes 137 80 78 71 13 10 26 10) and 11.2.2 "IHDR"
// (the first chunk; width and height are its first two 4-byte big-endian fields, so file offsets
// 16 and 20). Section numbers from memory; the byte values match the specification's signature.
const PNG_SIGNATURE = [137, 80, 78, 71, 13, 10, 26, 10]

const HOUR = 3_600_000
const start = Date.UTC(2026, 6, 15, 6, 0)
const points: Array<[number, number]> = Array.from({ length: 24 }, (_, i) => [start + i * 15 * 60_000, 25 + Math.sin(i / 3)])

describe('trend chart', () => {
  it('renders a PNG of 600 × 240', async () => {
    const png = await renderTrendPng({ points, band: { min: 24, max: 28 }, title: 'Reef 2 · Temperature', unitLabel: '°C', timeZone: 'Europe/Berlin' })
    expect([...png.subarray(0, 8)]).toEqual(PNG_SIGNATURE)
    expect(png.subarray(12, 16).toString('ascii')).toBe('IHDR')
    expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([600, 240])
    const meta = await sharp(png).metadata()
    expect([meta.format, meta.width, meta.height]).toEqual(['png', 600, 240])
  })

  it('labels the time axis in the site zone (06:00–10:00 UTC is 08:00–12:00 in Berlin in July)', async () => {
    // IANA tz database, file `europe`: Europe/Berlin observes UTC+2 in July.
    const svg = await renderTrendSvg({
      points: [
        [start, 25],
        [start + 4 * HOUR, 26],
      ],
      title: 'T',
      unitLabel: '°C',
      timeZone: 'Europe/Berlin',
    })
    const labels = [...svg.matchAll(/>(\d\d:\d\d)</g)].map((m) => m[1])
    expect(labels).toContain('08:00')
    expect(labels).toContain('12:00')
    expect(labels).not.toContain('06:00')
  })

  it('escapes the title in the SVG and still renders with no points', async () => {
    const svg = await renderTrendSvg({ points: [], title: 'Tank <b>&', unitLabel: 'pH', timeZone: 'UTC' })
    expect(svg).not.toContain('<b>')
    const png = await renderTrendPng({ points: [], title: 'Empty', unitLabel: 'pH', timeZone: 'UTC' })
    expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([600, 240])
  })
})
