import { describe, expect, it } from 'vitest'
import WallTile from '@/components/wall/WallTile.vue'
import { CHIME_REPEAT_MS, ringingTanks, shouldChime } from '@/components/wall/chime-plan'
import { NOW, wallTank } from './fixtures/wall'
import { mountView } from './mount'

const alarm = (id: number, state: 'open' | 'acknowledged' = 'open', maintenance = false) =>
  wallTank(id, {
    state: 'alarm',
    openIncident: { id: 100 + id, title: 'Too warm', severity: 'alarm', openedAt: new Date(NOW).toISOString(), state, maintenance, siteIncidentId: null },
  })

describe('when the wall chimes', () => {
  it('rings for alarms nobody has acknowledged, not for acknowledged ones or ones during maintenance', () => {
    expect(ringingTanks([alarm(1), alarm(2, 'acknowledged'), alarm(3, 'open', true), wallTank(4)])).toEqual([1])
  })

  it('chimes at once for a tile entering alarm, then every few minutes, never while muted or off', () => {
    const state = { enabled: true, mutedUntil: null, known: new Set<number>(), lastAt: null }
    expect(shouldChime(state, [1], NOW)).toBe(true)
    const after = { ...state, known: new Set([1]), lastAt: NOW }
    expect(shouldChime(after, [1], NOW + CHIME_REPEAT_MS - 1)).toBe(false)
    expect(shouldChime(after, [1], NOW + CHIME_REPEAT_MS)).toBe(true)
    expect(shouldChime(after, [1, 2], NOW + 1000)).toBe(true) // a second tile enters alarm
    expect(shouldChime({ ...after, mutedUntil: NOW + 3600_000 }, [1, 2], NOW + 1000)).toBe(false)
    expect(shouldChime({ ...state, enabled: false }, [1], NOW)).toBe(false)
    expect(shouldChime(after, [], NOW + CHIME_REPEAT_MS)).toBe(false)
  })
})

describe('the tile says when it flaps or is in maintenance', () => {
  it('shows the flap count and the maintenance window in the site zone', async () => {
    const { wrapper } = await mountView(WallTile, {
      props: {
        tank: wallTank(7, {
          state: 'watch',
          flapping: { count: 4, title: 'Temperature above 28 °C' },
          maintenanceUntil: '2026-03-03T13:30:00.000Z',
          maintenanceReason: 'Heater swap',
        }),
        now: NOW,
        timeZone: 'Europe/Berlin',
      },
    })
    expect(wrapper.find('[data-test="tile-flapping"]').text()).toBe('Flapping: cleared and came back 4 times')
    // Berlin is UTC+1 in early March (Directive 2000/84/EC: summer time from the last Sunday of March).
    expect(wrapper.find('[data-test="tile-maintenance"]').text()).toBe('Maintenance until 14:30: Heater swap')
  })
})
