import { describe, expect, it } from 'vitest'
import { MIN_TILE, pageSlice, wallLayout } from '@/components/wall/wall-layout'
import { heaterLine, lightLine } from '@/components/wall/tile-format'

// A 1920 × 1080 TV less the header strip (72 px) and the grid's padding (24 px each way).
const tv = { width: 1896, height: 984 }

describe('wallLayout', () => {
  it('puts 12 tanks on one page of a TV with tiles larger than the minimum', () => {
    const layout = wallLayout(12, tv)
    expect(layout.pages).toBe(1)
    expect(layout.scroll).toBe(false)
    expect(layout.columns * layout.rows).toBeGreaterThanOrEqual(12)
    expect(layout).toMatchObject({ columns: 4, rows: 3 })
    expect(layout.tileWidth).toBeGreaterThan(MIN_TILE.width)
    expect(layout.tileHeight).toBeGreaterThan(MIN_TILE.height)
  })

  it('pages 200 tanks at the smallest readable tile: 6 × 4 per page, 9 pages', () => {
    // Columns: ⌊(1896 + 12) / (300 + 12)⌋ = 6; rows: ⌊(984 + 12) / (230 + 12)⌋ = 4.
    const layout = wallLayout(200, tv)
    expect(layout).toMatchObject({ columns: 6, rows: 4, perPage: 24, pages: 9, scroll: false })
    const tanks = Array.from({ length: 200 }, (_, i) => i)
    expect(pageSlice(tanks, layout, 0)).toEqual(tanks.slice(0, 24))
    expect(pageSlice(tanks, layout, 8)).toEqual(tanks.slice(192, 200))
    expect(pageSlice(tanks, layout, 9)).toEqual(tanks.slice(0, 24))
  })

  it('scrolls one column on a phone instead of turning pages', () => {
    const layout = wallLayout(200, { width: 366, height: 700 })
    expect(layout).toMatchObject({ columns: 1, pages: 1, scroll: true })
    expect(pageSlice([1, 2, 3], layout, 5)).toEqual([1, 2, 3])
  })

  it('fills a portrait tablet with two columns', () => {
    expect(wallLayout(8, { width: 776, height: 960 })).toMatchObject({ columns: 2, scroll: true })
  })
})

describe('heaterLine', () => {
  it('says how far the water is above the heater top', () => {
    expect(heaterLine(38.5, 30)).toEqual({ text: '8.5 cm above heater', tone: 'steady', marginCm: 8.5 })
    expect(heaterLine(31.2, 30)?.tone).toBe('watch')
  })

  it('raises the alarm tone when the heater top is out of the water', () => {
    expect(heaterLine(28, 30)).toEqual({ text: '2.0 cm below heater top', tone: 'alarm', marginCm: -2 })
    expect(heaterLine(30, 30)?.tone).toBe('alarm')
  })

  it('says nothing without a level or a heater', () => {
    expect(heaterLine(null, 30)).toBeNull()
    expect(heaterLine(30, null)).toBeNull()
  })
})

describe('lightLine', () => {
  const schedule = { on: '09:00', off: '19:00' }
  it('compares the light with its schedule', () => {
    expect(lightLine(true, true, schedule)).toMatchObject({ word: 'Light on', offSchedule: false, detail: 'as scheduled 09:00–19:00' })
    expect(lightLine(false, true, schedule)).toMatchObject({ word: 'Light off', offSchedule: true, detail: 'should be on (09:00–19:00)' })
    expect(lightLine(null, true, schedule)).toBeNull()
  })
})
