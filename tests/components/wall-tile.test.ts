import { afterEach, describe, expect, it } from 'vitest'
import type { TankState } from '@shared/schemas/tank-status'
import WallTile from '@/components/wall/WallTile.vue'
import { reloadUnitPreference, TEMPERATURE_UNIT_KEY } from '@/composables/useUnits'
import { useLiveStore } from '@/stores/live'
import { NOW, wallTank } from './fixtures/wall'
import { mountView } from './mount'

afterEach(() => {
  localStorage.removeItem(TEMPERATURE_UNIT_KEY)
  reloadUnitPreference()
})

async function tile(overrides: Parameters<typeof wallTank>[1] = {}, now = NOW) {
  const { wrapper } = await mountView(WallTile, { props: { tank: wallTank(4, overrides), now, timeZone: 'Europe/Berlin', showTrend: false } })
  return wrapper
}

describe('WallTile', () => {
  it.each([
    ['steady', 'Steady', 'mdi-check-circle'],
    ['watch', 'Watch', 'mdi-eye'],
    ['alarm', 'Alarm', 'mdi-alert-octagon'],
    ['quiet', 'Quiet', 'mdi-access-point-network-off'],
    ['no_sensor', 'No sensor', 'mdi-help-circle-outline'],
  ] as const)('shows the %s state as a word and its own icon, not colour alone', async (state, word, icon) => {
    const wrapper = await tile({ state: state as TankState })
    expect(wrapper.find('[data-test="tile-state"]').text()).toBe(word)
    expect(wrapper.find('[data-test="tile-state-icon"]').classes()).toContain(icon)
    expect(wrapper.find('article').attributes('data-state')).toBe(state)
  })

  it('says a tank without a sensor has nothing measuring it, instead of showing empty figures', async () => {
    const wrapper = await tile({ state: 'no_sensor', latest: {}, stateReasons: ['No sensor and no test-kit entry'], newestReadingAt: null })
    expect(wrapper.find('[data-test="tile-no-sensor"]').text()).toContain('Nothing measures this tank')
    expect(wrapper.find('[data-test="tile-temperature"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="tile-age"]').text()).toBe('no readings')
  })

  it('names the metric and the span of its trend line', async () => {
    const { wrapper } = await mountView(WallTile, { props: { tank: wallTank(4), now: NOW, timeZone: 'Europe/Berlin', showTrend: true } })
    expect(wrapper.find('[data-test="tile-trend-label"]').text()).toBe('Temperature · last 6 h')
  })

  it('shows the temperature in °C with one decimal, pH with two, and the heater margin', async () => {
    const wrapper = await tile()
    expect(wrapper.find('[data-test="tile-temperature"]').text()).toBe('25.4°C')
    expect(wrapper.find('[data-test="tile-ph"]').text()).toBe('pH 7.12')
    expect(wrapper.find('[data-test="heater-line"]').text()).toBe('8.5 cm above heater')
    expect(wrapper.find('[data-test="tile-light"]').text()).toContain('Light on')
    expect(wrapper.find('[data-test="tile-age"]').text()).toBe('2 min ago')
  })

  it('shows °F for someone who prefers it (25.4 °C = 77.72 °F, t/°F = 1.8 t/°C + 32, NIST SP 811, 2008, Appendix B)', async () => {
    localStorage.setItem(TEMPERATURE_UNIT_KEY, 'F')
    reloadUnitPreference()
    const wrapper = await tile()
    expect(wrapper.find('[data-test="tile-temperature"]').text()).toBe('77.7°F')
  })

  it('warns when the water is below the heater top', async () => {
    const wrapper = await tile({ latest: { water_level: { value: 28, time: '2026-03-03T11:58:00.000Z', source: 'device' } } })
    const line = wrapper.find('[data-test="heater-line"]')
    expect(line.text()).toBe('2.0 cm below heater top')
    expect(line.classes()).toContain('text-alarm')
    expect(wrapper.find('[data-test="tile-temperature"]').text()).toBe('—')
  })

  it('shows the open incident and the snooze in the site zone', async () => {
    const wrapper = await tile({
      state: 'alarm',
      openIncident: {
        id: 9,
        title: 'Temperature above 28 °C',
        severity: 'alarm',
        openedAt: '2026-03-03T11:40:00.000Z',
        state: 'open',
        maintenance: false,
        siteIncidentId: null,
      },
      snoozedUntil: '2026-03-03T13:30:00.000Z',
    })
    expect(wrapper.find('[data-test="tile-incident"]').text()).toBe('Temperature above 28 °C')
    // 13:30 UTC is 14:30 in Berlin in March (CET, UTC+1).
    expect(wrapper.find('[data-test="tile-snooze"]').text()).toBe('Alerts snoozed until 14:30')
  })

  it('takes a newer live reading over the payload at once', async () => {
    const wrapper = await tile()
    useLiveStore().ingest([{ tankId: 4, metric: 'temperature', time: '2026-03-03T11:59:30.000Z', value: 26.05, source: 'device' }])
    await wrapper.vm.$nextTick()
    expect(wrapper.find('[data-test="tile-temperature"]').text()).toBe('26.1°C')
    expect(wrapper.find('[data-test="tile-age"]').text()).toBe('just now')
  })

  it('draws the trend line and describes it: metric, span, lowest and highest', async () => {
    const { wrapper } = await mountView(WallTile, { props: { tank: wallTank(5), now: NOW, timeZone: 'UTC' } })
    expect(wrapper.find('.tw-spark').attributes('role')).toBe('img')
    expect(wrapper.find('.tw-spark').attributes('aria-label')).toBe('Temperature over the last 6 hours for Tank 5: lowest 25.2 °C, highest 25.3 °C')
  })

  it('describes the trend with the live readings that arrived since, and leaves out what is older than 6 hours', async () => {
    const trend = [
      { t: '2026-03-03T05:00:00.000Z', value: 22.0 },
      { t: '2026-03-03T10:00:00.000Z', value: 25.2 },
    ]
    const { wrapper } = await mountView(WallTile, { props: { tank: wallTank(6, { trend }), now: NOW, timeZone: 'UTC' } })
    useLiveStore().ingest([{ tankId: 6, metric: 'temperature', time: '2026-03-03T11:59:00.000Z', value: 26.4, source: 'device' }])
    await wrapper.vm.$nextTick()
    expect(wrapper.find('.tw-spark').attributes('aria-label')).toBe('Temperature over the last 6 hours for Tank 6: lowest 25.2 °C, highest 26.4 °C')
  })

  it('says when every reading of the trend is the same, in the unit the person reads', async () => {
    localStorage.setItem(TEMPERATURE_UNIT_KEY, 'F')
    reloadUnitPreference()
    const trend = [
      { t: '2026-03-03T10:00:00.000Z', value: 25 },
      { t: '2026-03-03T11:00:00.000Z', value: 25 },
    ]
    const { wrapper } = await mountView(WallTile, { props: { tank: wallTank(7, { trend }), now: NOW, timeZone: 'UTC' } })
    // 25 °C = 77 °F (t/°F = 1.8 t/°C + 32, NIST SP 811, 2008, Appendix B).
    expect(wrapper.find('.tw-spark').attributes('aria-label')).toBe('Temperature over the last 6 hours for Tank 7: every reading 77.0 °F')
  })
})
