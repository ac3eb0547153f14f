import { describe, expect, it } from 'vitest'
import { describeMeasurement } from '@shared/rules/measurement'
import { incidentOpened, type IncidentMailInput } from '../../server/mail/templates'
import { renderTrendSvg } from '../../server/mail/trend-chart'
import { firstStep } from '../../server/incidents/what-to-check'

const input = (over: Partial<IncidentMailInput>): IncidentMailInput => ({
  organizationName: 'Riverside Aquatics',
  siteName: 'Fish room',
  tankName: 'Breeding cylinder C1',
  ruleName: 'No temperature reading for 15 min',
  severity: 'warning',
  metricLabel: 'Temperature',
  value: 15.15,
  unitLabel: '°C',
  since: '2026-12-05T01:00:00Z',
  siteTimeZone: 'Europe/London',
  whatToCheck: [],
  incidentUrl: 'https://tw.example/incidents/3',
  ...over,
})

/** The text of every time-axis label in a rendered chart, left to right as drawn. */
const timeLabels = (svg: string) => [...svg.matchAll(/<text[^>]*>(\d\d:\d\d)<\/text>/g)].map((m) => m[1])

describe('alert mails say what was measured, in its unit', () => {
  it('the quiet-sensor mail counts minutes without a reading, not degrees', () => {
    const quiet = { kind: 'quiet' as const, metric: 'temperature' as const, quietMinutes: 15 }
    const measurement = describeMeasurement({ spec: quiet, metric: 'temperature', value: 15.15 })
    expect(measurement).toBe('no temperature reading for 15 min')
    const mail = incidentOpened(input({ measurement, firstStep: firstStep(quiet, 'temperature', 15.15) }))
    expect(mail.subject).toBe('Warning: no temperature reading for 15 min on Breeding cylinder C1 · Fish room')
    expect(mail.text.split('\n')[0]).toBe('First: look at the tank yourself (by eye and with a thermometer), then check the sensor node’s power and network.')
    expect(mail.text).toContain('opened an incident: no temperature reading for 15 min.')
    expect(mail.text).not.toContain('15.15 °C')
  })

  it('the rate mail says which way and how far pH moved, in what time', () => {
    const rate = { kind: 'rate' as const, metric: 'ph' as const, maxChange: 0.3, windowMinutes: 1440 }
    const measurement = describeMeasurement({ spec: rate, metric: 'ph', value: -0.3125 })
    expect(measurement).toBe('pH fell 0.31 in 24 h')
    const mail = incidentOpened(
      input({
        ruleName: 'pH changed by more than 0.3 in 24 h',
        metricLabel: 'pH',
        unitLabel: 'pH',
        value: -0.3125,
        measurement,
        firstStep: firstStep(rate, 'ph', -0.3125),
      }),
    )
    expect(mail.subject).toBe('Warning: pH fell 0.31 in 24 h on Breeding cylinder C1 · Fish room')
    expect(mail.text.split('\n')[0]).toBe('First: test pH and KH with a test kit before dosing or changing water.')
    expect(mail.text).not.toContain('-0.31 pH')
  })

  it('a band mail gives the reading at display precision and the band it left', () => {
    const band = { kind: 'outside' as const, metric: 'temperature' as const, min: 10, max: 22, holdMinutes: 0, clearMargin: 0.5 }
    expect(describeMeasurement({ spec: band, metric: 'temperature', value: 23.502 })).toBe('temperature 23.5 °C, above 10–22 °C')
    expect(describeMeasurement({ spec: band, metric: 'temperature', value: 9 })).toBe('temperature 9.0 °C, below 10–22 °C')
    const heater = { kind: 'heater_line' as const, marginCm: 0, holdMinutes: 0, clearMargin: 0.5 }
    expect(describeMeasurement({ spec: heater, metric: 'water_level', value: 29.04, heaterTopCm: 30 })).toBe(
      'water level 29.0 cm, at or below the heater top (30 cm)',
    )
  })

  it('a heater alarm starts with switching the heater off at the socket', () => {
    const hot = { kind: 'above' as const, metric: 'temperature' as const, limit: 28, holdMinutes: 10, clearMargin: 0.5 }
    expect(firstStep(hot, 'temperature', 29.4)).toBe(
      'First: if the heater is stuck on, switch it off at the socket (dry hands) and check it is fully submerged.',
    )
  })
})

describe('the mail chart time axis', () => {
  it('a minute of readings gets minute ticks, each label different (not "01:11" on every tick)', async () => {
    const base = Date.UTC(2026, 11, 5, 1, 11, 5)
    const points = Array.from({ length: 20 }, (_, i) => [base + i * 3000, 25 + i * 0.01] as [number, number])
    const svg = await renderTrendSvg({ points, title: 'Temperature', unitLabel: '°C', timeZone: 'Europe/London' })
    const labels = timeLabels(svg)
    expect(labels).toEqual(['01:11', '01:12', '01:13', '01:14', '01:15', '01:16', '01:17'])
  })

  it('the last six hours get hourly ticks in the site zone', async () => {
    const to = Date.UTC(2026, 6, 15, 10, 40)
    const points = Array.from({ length: 30 }, (_, i) => [to - 20 * 60_000 + i * 40_000, 26] as [number, number])
    const svg = await renderTrendSvg({ points, title: 'Temperature', unitLabel: '°C', timeZone: 'Europe/Berlin', window: { from: to - 6 * 3600_000, to } })
    const labels = timeLabels(svg)
    expect(new Set(labels).size).toBe(labels.length)
    // 04:40–10:40 UTC is 06:40–12:40 in Berlin in July (CEST, UTC+2).
    expect([...labels].sort()).toEqual(['06:00', '07:00', '08:00', '09:00', '10:00', '11:00', '12:00', '13:00'])
  })
})
