import { describe, expect, it } from 'vitest'
import { tanksFromSheet } from '@shared/tank-import'

describe('tanks from a sheet', () => {
  it('reads name, site, kind, volume and set point by their headers, in any order and spelling', () => {
    const { rows, errors } = tanksFromSheet([
      ['Volume (L)', 'Tank name', 'Site', 'Type', 'Set point'],
      ['120', 'Sales row A1', 'Front shop', 'Tropical freshwater', '25'],
      ['96,5 L', 'Coldwater 1', 'Front shop', 'coldwater', ''],
      ['', '', '', '', ''],
      ['300', 'Reef 2', 'Fish room', 'marine', '25.5 °C'],
    ])
    expect(errors).toEqual({})
    expect(rows).toEqual([
      // common practice: about 1 W per litre for a 5 °C lift over a 20 °C room, rounded up to a heater sold (150 W).
      { row: 2, name: 'Sales row A1', siteName: 'Front shop', kind: 'tropical_freshwater', volumeLitres: 120, heater: { watts: 150, setPointC: 25, topCm: 0 } },
      { row: 3, name: 'Coldwater 1', siteName: 'Front shop', kind: 'coldwater', volumeLitres: 96.5, heater: null },
      // A 5.5 °C lift: 300 L × 5.5 / 5 = 330 W by the same rule, so the next size up, 400 W.
      { row: 5, name: 'Reef 2', siteName: 'Fish room', kind: 'marine', volumeLitres: 300, heater: { watts: 400, setPointC: 25.5, topCm: 0 } },
    ])
  })

  it('names every bad cell by its row and column, and returns no tank at all then', () => {
    const { rows, errors } = tanksFromSheet([
      ['name', 'site', 'kind', 'volume', 'set point'],
      ['Good one', 'Shop', 'planted', '60', ''],
      ['', 'Shop', 'lagoon', '-4', '50'],
      ['Good one', 'shop', 'planted', '60', ''],
    ])
    expect(rows).toEqual([])
    expect(errors).toEqual({
      'row 3, name': 'required',
      'row 3, kind': 'one of Tropical freshwater, Planted, Coldwater, Brackish, Marine',
      'row 3, volume': 'litres, above 0 and at most 100 000',
      'row 3, set point': '°C from 5 to 35, or empty for no heater',
      'row 4, name': 'named twice for the same site',
    })
  })

  it('asks for the missing columns, and for rows below the headers', () => {
    expect(
      tanksFromSheet([
        ['name', 'volume'],
        ['A', '10'],
      ]).errors,
    ).toEqual({ columns: 'the first row must name the columns site, kind (set point is optional)' })
    expect(tanksFromSheet([['name', 'site', 'kind', 'volume']]).errors).toEqual({ rows: 'no tanks below the headers' })
  })
})
