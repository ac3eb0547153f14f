import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { acclimationPlan } from '@shared/care/acclimation'
import type { AcclimationResult } from '@shared/schemas/care-api'
import AcclimationTimer from '@/components/care/AcclimationTimer.vue'
import { mountView } from '../mount'

// A 1 L bag at 22 °C into a 25 °C tank, one addition every 5 minutes over the half hour
// (the interval and the half hour are `common practice`, see shared/care/acclimation).
function planFor(): AcclimationResult {
  return { ...acclimationPlan({ bagLitres: 1, bagTempC: 22, tankTempC: 25, intervalMinutes: 5 }), tankTempC: { value: 25, source: 'reading' }, tankPh: null }
}

// useNow shares one interval per period while anyone watches, so each timer must unmount
// before the next test fakes the clock.
const mounted: Array<{ unmount: () => void }> = []
afterEach(() => {
  mounted.splice(0).forEach((w) => w.unmount())
  vi.useRealTimers()
})

async function mountTimer() {
  const { wrapper } = await mountView(AcclimationTimer, {
    props: {
      plan: planFor(),
      arrival: '12 × Neon tetra',
      watchUntil: '2026-03-06T10:00:00.000Z',
      quarantine: { startedAt: '2026-03-01T10:00:00.000Z', endsAt: '2026-03-29T10:00:00.000Z', daysIn: 2, daysRemaining: 26, days: 28 },
      timeZone: 'UTC',
    },
  })
  mounted.push(wrapper)
  await flushPromises()
  return wrapper
}

const step = (wrapper: Awaited<ReturnType<typeof mountTimer>>, index: number) => wrapper.find(`[data-test="acclimation-step-${index}"]`)

describe('AcclimationTimer', () => {
  it('renders every addition of the plan with the container temperature estimated after it', async () => {
    const wrapper = await mountTimer()
    expect(wrapper.findAll('[data-test^="acclimation-step-"]')).toHaveLength(6)
    expect(step(wrapper, 0).text()).toContain("Add 0.17 L, 1/6 of the bag's volume, of tank water")
    // Heat balance of two lots of water (equal specific heat), worked by hand:
    // (1 L × 22 °C + 1/6 L × 25 °C) / (7/6 L) = 157/7 °C ≈ 22.4 °C after the first addition;
    // after all six the bag has taken 1 L of tank water in all, (22 + 25) / 2 = 23.5 °C.
    expect(step(wrapper, 0).find('[data-test="acclimation-estimate"]').text()).toBe('Container afterwards: about 22.4 °C')
    expect(step(wrapper, 5).find('[data-test="acclimation-estimate"]').text()).toBe('Container afterwards: about 23.5 °C')
    expect(step(wrapper, 5).find('[data-test="acclimation-countdown"]').text()).toBe('· at 25 min')
    expect(wrapper.find('[data-test="acclimation-net"]').text()).toContain('at 30 min')
    expect(wrapper.find('[data-test="acclimation-aftercare"]').text()).toContain('Watch the new arrivals closely until 6 Mar, 10:00')
    expect(wrapper.find('[data-test="acclimation-quarantine"]').text()).toBe('Quarantine: 26 of 28 days remaining.')
  })

  it('counts down to each addition once started and offers Done at the end', async () => {
    vi.useFakeTimers({ toFake: ['Date', 'setInterval', 'clearInterval'], now: new Date('2026-03-03T10:00:00Z') })
    const wrapper = await mountTimer()
    await wrapper.find('[data-test="acclimation-start"]').trigger('click')
    expect(step(wrapper, 0).attributes('data-state')).toBe('now')
    expect(step(wrapper, 0).find('[data-test="acclimation-countdown"]').text()).toBe('· add now · next in 5:00')
    expect(step(wrapper, 1).find('[data-test="acclimation-countdown"]').text()).toBe('· in 5:00')

    // Jump the clock and let one tick of the timer's one-second interval run.
    const jumpTo = async (minutes: number) => {
      vi.setSystemTime(new Date(Date.parse('2026-03-03T10:00:00Z') + minutes * 60_000 - 1000))
      await vi.advanceTimersByTimeAsync(1000)
    }
    await jumpTo(6)
    expect(step(wrapper, 0).attributes('data-state')).toBe('added')
    expect(step(wrapper, 1).attributes('data-state')).toBe('now')
    expect(step(wrapper, 1).find('[data-test="acclimation-countdown"]').text()).toBe('· add now · next in 4:00')
    expect(wrapper.find('[data-test="acclimation-done"]').text()).toBe('Done early')

    await jumpTo(30)
    expect(step(wrapper, 5).attributes('data-state')).toBe('added')
    expect(wrapper.find('[data-test="acclimation-done"]').text()).toBe('Done')
    await wrapper.find('[data-test="acclimation-done"]').trigger('click')
    expect(wrapper.findComponent(AcclimationTimer).emitted('done')).toHaveLength(1)
  })
})
