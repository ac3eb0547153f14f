import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, shallowRef } from 'vue'
import type { WallTank } from '@shared/schemas/wall'
import WallSound from '@/components/wall/WallSound.vue'
import { NOW, wallTank } from './fixtures/wall'
import { mountView } from './mount'
import { until } from '../helpers/wait'

// Sound on a wall is the display's choice, made by a tap each time the wall is opened: an alarm
// never makes a screen start chiming by itself.

const alarm = wallTank(1, {
  state: 'alarm',
  openIncident: {
    id: 9,
    title: 'Temperature above 30 °C',
    severity: 'alarm',
    openedAt: '2026-03-03T11:50:00.000Z',
    state: 'open',
    maintenance: false,
    siteIncidentId: null,
  },
})
let plays = 0

/** The sound control as the wall holds it: the wall's tanks and clock move under it. */
async function mountSound() {
  const tanks = shallowRef<WallTank[]>([wallTank(2)])
  const now = shallowRef(NOW)
  const Host = defineComponent({ setup: () => () => h(WallSound, { tanks: tanks.value, now: now.value, timeZone: 'UTC' }) })
  const { wrapper } = await mountView(Host)
  return {
    wrapper,
    async set(next: { tanks?: WallTank[]; now?: number }) {
      if (next.tanks) tanks.value = next.tanks
      if (next.now) now.value = next.now
      await flushPromises()
    },
  }
}

beforeEach(() => {
  plays = 0
  vi.spyOn(HTMLMediaElement.prototype, 'play').mockImplementation(async function (this: HTMLMediaElement) {
    if (!this.muted) plays++
  })
  vi.spyOn(HTMLMediaElement.prototype, 'pause').mockImplementation(() => undefined)
})
afterEach(() => {
  vi.restoreAllMocks()
})

describe('the wall sound is opt-in', () => {
  it('stays silent through an alarm and its repeats while nobody has tapped to enable it', async () => {
    const { wrapper, set } = await mountSound()
    await set({ tanks: [alarm, wallTank(2)], now: NOW + 60_000 })
    for (let minute = 2; minute <= 30; minute++) await set({ now: NOW + minute * 60_000 })
    expect(plays).toBe(0)
    expect(wrapper.find('[data-test=wall-sound-enable]').text()).toBe('Tap to enable sound')
  })

  it('chimes for an alarm once someone has tapped to enable it', async () => {
    const { wrapper, set } = await mountSound()
    await wrapper.find('[data-test=wall-sound-enable]').trigger('click')
    await flushPromises()
    expect(plays).toBe(0)
    // The mute menu's code comes in once sound is on.
    await until(async () => (await flushPromises(), wrapper.find('[data-test=wall-sound-on]').exists()))
    expect(wrapper.find('[data-test=wall-sound-on]').text()).toBe('Sound on')
    await set({ tanks: [alarm, wallTank(2)], now: NOW + 60_000 })
    expect(plays).toBe(1)
  })

  it('starts silent again when the wall is opened afresh', async () => {
    const first = await mountSound()
    await first.wrapper.find('[data-test=wall-sound-enable]').trigger('click')
    await flushPromises()
    first.wrapper.unmount()

    const again = await mountSound()
    await again.set({ tanks: [alarm], now: NOW + 60_000 })
    expect(plays).toBe(0)
    expect(again.wrapper.find('[data-test=wall-sound-enable]').exists()).toBe(true)
  })
})
