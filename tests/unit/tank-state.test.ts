import { describe, expect, it } from 'vitest'
import { compareForWall, tankState, type TankStateInput } from '@shared/tank-state'

const targets = { temperature: { min: 24, max: 28 } }
const base: TankStateInput = { latest: {}, targets, openIncidents: [], quietDevices: [], hasDevices: false }

describe('tankState', () => {
  it('says a tank with no device and no reading has no sensor, not that it is steady', () => {
    expect(tankState(base)).toEqual({ state: 'no_sensor', reasons: ['No sensor and no test-kit entry'] })
  })

  it('judges a tank without devices by its test-kit readings once it has some', () => {
    expect(tankState({ ...base, latest: { temperature: { value: 26 } } }).state).toBe('steady')
    expect(tankState({ ...base, latest: { temperature: { value: 30 } } }).state).toBe('watch')
  })

  it('calls a tank with a device but no reading yet steady (its device has not had time to fall quiet)', () => {
    expect(tankState({ ...base, hasDevices: true }).state).toBe('steady')
  })

  it('lets an open incident outrank the missing sensor', () => {
    expect(tankState({ ...base, openIncidents: [{ severity: 'alarm', title: 'Too warm' }] }).state).toBe('alarm')
    expect(tankState({ ...base, openIncidents: [{ severity: 'warning', title: 'Kit check overdue' }] })).toEqual({
      state: 'watch',
      reasons: ['Kit check overdue'],
    })
  })

  it('puts a tank without a sensor after quiet tanks and before steady ones on the wall', () => {
    const tile = (state: 'quiet' | 'no_sensor' | 'steady', name: string) => ({ state, sortOrder: 0, name })
    const sorted = [tile('steady', 'A'), tile('no_sensor', 'B'), tile('quiet', 'C')].sort(compareForWall)
    expect(sorted.map((t) => t.name)).toEqual(['C', 'B', 'A'])
  })
})
