import { describe, expect, it } from 'vitest'
import type { ReportMetric, TankReport } from '@shared/schemas/reports'
import ReportTankSection from '@/components/report/ReportTankSection.vue'
import { mountView } from '../mount'

const FROM = '2026-11-01T23:00:00.000Z'
const TO = '2026-11-08T23:00:00.000Z'
const metric = (overrides: Partial<ReportMetric>): ReportMetric => ({
  metric: 'temperature',
  label: 'Temperature',
  unitLabel: '°C',
  band: { min: 24, max: 28 },
  readings: 937,
  coveragePercent: 92.857,
  timeInBandPercent: 98.718,
  belowMs: 0,
  aboveMs: 7_200_000,
  min: 26,
  max: 29,
  mean: 26.038,
  gapLimitMs: 1_800_000,
  gaps: [{ from: '2026-11-03T23:00:00.000Z', to: '2026-11-04T11:00:00.000Z', durationMs: 43_200_000 }],
  series: [
    [Date.parse(FROM) + 1000, 26],
    [Date.parse(FROM) + 2000, null],
    [Date.parse(FROM) + 3000, 29],
  ],
  ...overrides,
})
const tank: TankReport = {
  tankId: 7,
  name: 'Marrowfen <b>display</b>',
  volumeLitres: 200,
  metrics: [
    metric({}),
    metric({ metric: 'ph', label: 'pH', unitLabel: 'pH', band: { min: 6.5, max: null }, gaps: [], min: 7.1, max: 7.3, mean: 7.2, timeInBandPercent: 100 }),
  ],
  incidents: [
    {
      id: 1,
      title: 'Temperature above 28 °C',
      severity: 'alarm',
      metric: 'temperature',
      openedAt: '2026-11-03T10:00:00.000Z',
      acknowledgedAt: '2026-11-03T10:10:00.000Z',
      resolvedAt: '2026-11-03T11:10:00.000Z',
      timeToAcknowledgeMs: 600_000,
      timeToResolveMs: 4_200_000,
    },
    {
      id: 2,
      title: 'Again',
      severity: 'alarm',
      metric: 'temperature',
      openedAt: '2026-11-06T08:00:00.000Z',
      acknowledgedAt: '2026-11-06T08:30:00.000Z',
      resolvedAt: null,
      timeToAcknowledgeMs: 1_800_000,
      timeToResolveMs: null,
    },
  ],
  incidentSummary: { opened: 2, stillOpen: 1, meanTimeToAcknowledgeMs: 1_200_000, meanTimeToResolveMs: 4_200_000 },
  care: { tasks: [{ id: 1, title: 'Clean the glass', kind: 'glass_clean', due: 2, done: 1 }], due: 2, done: 1 },
  water: { changes: 1, litres: 40 },
  livestock: { added: 6, removed: 0, lost: 1, changes: [{ at: '2026-11-03T09:00:00.000Z', kind: 'added', text: 'Added 6 × Ember tetra', count: 6 }] },
  photos: [],
}

describe('ReportTankSection', () => {
  it('shows the figures, the gap, the open band, incidents, care, water and livestock; names stay text', async () => {
    const { wrapper } = await mountView(ReportTankSection, { props: { tank, from: FROM, to: TO, timeZone: 'Europe/Berlin' } })
    const temp = wrapper.find('[data-test="report-metric-temperature"]')
    expect(temp.find('[data-test="time-in-band"]').text()).toBe('98.7 %')
    expect(temp.text()).toContain('Target 24.0–28.0 °C')
    expect(temp.text()).toContain('29.0 °C')
    // 23:00 UTC on 3 November is midnight in Berlin (CET, UTC+1).
    expect(temp.find('[data-test="report-gaps"]').text()).toContain('1 gap without readings (12 h 00 min), not counted: Wed 4 Nov, 00:00 to Wed 4 Nov, 12:00')
    const ph = wrapper.find('[data-test="report-metric-ph"]')
    expect(ph.text()).toContain('Target ≥ pH 6.50')
    expect(ph.text()).toContain('No gaps in the readings.')
    const incidents = wrapper.find('[data-test="report-incidents"]').text()
    expect(incidents).toContain('2 opened, 1 still open')
    expect(incidents).toContain('Mean time to acknowledge 20 min, to resolve 1 h 10 min.')
    expect(incidents).toContain('still open')
    expect(wrapper.find('[data-test="report-care"]').text()).toContain('1 done of 2 due')
    expect(wrapper.find('[data-test="report-water"]').text()).toContain('40.0 L changed in 1 water change (20.0 % of the tank volume in total)')
    expect(wrapper.find('[data-test="report-livestock"]').text()).toContain('Added 6 · removed 0 · lost 1')
    expect(wrapper.find('[data-test="report-photos"]').text()).toContain('No photos in this period.')
    expect(wrapper.find('h2').text()).toContain('Marrowfen <b>display</b>')
    expect(wrapper.find('h2 b').exists()).toBe(false)
    wrapper.unmount()
  })
})
