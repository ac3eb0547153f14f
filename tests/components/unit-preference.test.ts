import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import UserMenu from '@/components/layout/UserMenu.vue'
import { formatReading, reloadUnitPreference, TEMPERATURE_UNIT_KEY } from '@/composables/useUnits'
import { formatBand } from '@/components/labels'
import { mountView } from './mount'

afterEach(() => {
  localStorage.removeItem(TEMPERATURE_UNIT_KEY)
  reloadUnitPreference()
})

describe('temperature unit preference', () => {
  it('switches every temperature to °F from the user menu and remembers it', async () => {
    const { wrapper } = await mountView(UserMenu, { role: 'keeper' })
    expect(formatReading('temperature', 25)).toBe('25.0 °C')
    await wrapper.find('button[data-test="account-menu"]').trigger('click')
    await flushPromises()
    await new DOMWrapper(document.querySelector('button[aria-label="°F, degrees Fahrenheit"]')!).trigger('click')
    await flushPromises()
    expect(localStorage.getItem(TEMPERATURE_UNIT_KEY)).toBe('F')
    // 25 °C = 77 °F and 24–27 °C = 75.2–80.6 °F (t/°F = 1.8 t/°C + 32, NIST SP 811, 2008, Appendix B).
    expect(formatReading('temperature', 25)).toBe('77.0 °F')
    expect(formatBand('temperature', { min: 24, max: 27 })).toBe('75.2 – 80.6 °F')
    // Other metrics keep their canonical units.
    expect(formatReading('ph', 7.2)).toBe('pH 7.20')
  })
})
