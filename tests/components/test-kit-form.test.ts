import { flushPromises } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import type { TestKitEntryInput } from '@shared/schemas/test-kit'
import TestKitForm from '@/components/testkit/TestKitForm.vue'
import { checkDraft, parseDecimal } from '@/components/testkit/kit-checks'
import { loadKitUnits } from '@/components/testkit/kit-units'
import { mountView } from './mount'

const targets = { ph: { min: 6.5, max: 7.5 }, temperature: { min: 24, max: 27 }, ammonia: { min: 0, max: 0.02 } }

async function mountForm(userId = 7) {
  const { wrapper } = await mountView(TestKitForm, { props: { targets, userId } })
  const form = wrapper.findComponent(TestKitForm)
  const fill = (name: string, value: string) => wrapper.find(`[name="${name}"]`).setValue(value)
  const submit = async () => {
    await wrapper.find('form').trigger('submit')
    await flushPromises()
  }
  const messagesFor = (name: string) => wrapper.find(`input[name="${name}"]`).element.closest('.v-input')?.querySelector('.v-messages')?.textContent?.trim()
  const noteFor = (metric: string) => wrapper.find(`[data-test="kit-note-${metric}"]`).text()
  return { wrapper, form, fill, submit, messagesFor, noteFor }
}

describe('parseDecimal', () => {
  it('reads a decimal point or a decimal comma and refuses anything else', () => {
    expect(parseDecimal('7.2')).toBe(7.2)
    expect(parseDecimal(' 7,2 ')).toBe(7.2)
    expect(parseDecimal('12')).toBe(12)
    expect(parseDecimal('7..2')).toBeNull()
    expect(parseDecimal('seven')).toBeNull()
    expect(parseDecimal('1,000.5')).toBeNull()
  })
})

describe('TestKitForm', () => {
  it('gives a field message for a bad number and emits nothing', async () => {
    const { form, fill, submit, messagesFor } = await mountForm()
    await fill('ph', '7..2')
    await submit()
    expect(messagesFor('ph')).toBe('enter a number')
    expect(form.emitted('save')).toBeUndefined()
  })

  it('asks for at least one value', async () => {
    const { wrapper, form, submit } = await mountForm()
    await submit()
    expect(wrapper.find('[data-test="kit-form-error"]').text()).toBe('Enter at least one value.')
    expect(form.emitted('save')).toBeUndefined()
  })

  it('warns before saving a value no kit could read, and does not save it', async () => {
    const { wrapper, form, fill, submit, noteFor } = await mountForm()
    await fill('ph', '15')
    expect(noteFor('ph')).toBe('No kit reads this: pH runs 0–14. Check the value and the unit.')
    await submit()
    expect(wrapper.find('[data-test="kit-form-warning"]').exists()).toBe(true)
    expect(form.emitted('save')).toBeUndefined()
  })

  it('notes a value outside the target band without blocking the save', async () => {
    const { form, fill, submit, noteFor } = await mountForm()
    await fill('ph', '8.1')
    expect(noteFor('ph')).toBe("Outside this tank's target band (6.50 – 7.50).")
    await submit()
    expect(form.emitted('save')).toHaveLength(1)
  })

  it('emits the values with the units the keeper uses, remembered per person', async () => {
    localStorage.setItem('tw.kitUnits.7', JSON.stringify({ temperature: 'F', nitrate: 'mg/L NO3-N' }))
    const { form, fill, submit } = await mountForm(7)
    await fill('temperature', '77')
    await fill('ph', '7,2')
    await fill('nitrate', '4.5')
    await fill('notes', '  after water change ')
    await submit()

    const emitted = form.emitted('save')
    expect(emitted).toHaveLength(1)
    const [payload, canonical] = emitted![0] as [TestKitEntryInput, Record<string, number>]
    expect(payload.values).toEqual([
      { metric: 'temperature', value: 77, unit: 'F' },
      { metric: 'ph', value: 7.2, unit: 'pH' },
      { metric: 'nitrate', value: 4.5, unit: 'mg/L NO3-N' },
    ])
    expect(payload.notes).toBe('after water change')
    expect(payload.takenAt).toMatch(/Z$/)
    // 77 °F = 25 °C exactly (t/°C = (t/°F − 32)/1.8, NIST SP 811, 2008, Appendix B).
    expect(canonical.temperature).toBeCloseTo(25, 9)
    // NO3 / N = 62.004 / 14.007 with CIAAW 2021 abridged atomic weights: 4.5 mg/L NO3-N ≈ 19.92 mg/L NO3.
    expect(canonical.nitrate).toBeCloseTo(19.92, 2)
    // Someone else on the same device starts from the defaults.
    expect(loadKitUnits(8).temperature).toBe('C')
  })
})

describe('checkDraft', () => {
  it('needs a temperature for oxygen in % saturation, and uses the tank latest when the entry has none', () => {
    const units = { ...loadKitUnits(null), oxygen: 'pct_sat' }
    const without = checkDraft({ takenAt: '', values: { oxygen: '90' }, units, notes: '' }, {})
    expect(without.warnings.oxygen).toBe('enter the temperature too, or give oxygen in mg/L')
    expect(without.payload).toBeNull()
    // 100 % at 25 °C is the solubility, 8.26 mg/L (ISO 5814:1990 table of oxygen solubility).
    const withLatest = checkDraft({ takenAt: '', values: { oxygen: '100' }, units, notes: '' }, {}, { temperatureC: 25 })
    expect(withLatest.canonical.oxygen).toBeCloseTo(8.26, 2)
    // The server reads % saturation with the entry's own temperature only, so with the tank's latest the form sends mg/L.
    expect(withLatest.payload?.values).toEqual([{ metric: 'oxygen', value: withLatest.canonical.oxygen, unit: 'mg/L' }])
    const withOwn = checkDraft({ takenAt: '', values: { oxygen: '100', temperature: '25' }, units, notes: '' }, {}, { temperatureC: 20 })
    expect(withOwn.payload?.values).toEqual([
      { metric: 'temperature', value: 25, unit: 'C' },
      { metric: 'oxygen', value: 100, unit: 'pct_sat' },
    ])
  })

  it('restates a hydrometer read at the water temperature through EOS-80 when the tank latest gives the temperature', () => {
    const units = { ...loadKitUnits(null), specific_gravity: 'SG_t' }
    const without = checkDraft({ takenAt: '', values: { specific_gravity: '1.025' }, units, notes: '' }, {})
    expect(without.warnings.specific_gravity).toBe('enter the temperature too, or give specific gravity in SG 25/25 °C')
    const withLatest = checkDraft({ takenAt: '', values: { specific_gravity: '1.025' }, units, notes: '' }, {}, { temperatureC: 28 })
    expect(withLatest.canonical.specific_gravity).toBeCloseTo(1.0259, 4)
    expect(withLatest.payload?.values).toEqual([{ metric: 'specific_gravity', value: withLatest.canonical.specific_gravity, unit: 'SG25' }])
  })
})

describe('TestKitForm on tanks of different water', () => {
  it('folds the reef and treatment tests away on a freshwater tank, and unfolds them on request', async () => {
    const { wrapper } = await mountForm()
    expect(wrapper.find('[data-test="kit-ph"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="kit-salinity"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="kit-copper"]').exists()).toBe(false)
    const more = wrapper.find('[data-test="kit-more"]')
    expect(more.text()).toContain('salinity')
    await more.trigger('click')
    expect(wrapper.find('[data-test="kit-copper"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="kit-more"]').exists()).toBe(false)
  })

  it('shows the tests a marine tank’s targets name', async () => {
    const marine = { ...targets, salinity: { min: 33.5, max: 35.5 }, calcium: { min: 380, max: 450 } }
    const { wrapper } = await mountView(TestKitForm, { props: { targets: marine, userId: 7 } })
    expect(wrapper.find('[data-test="kit-salinity"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="kit-calcium"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="kit-copper"]').exists()).toBe(false)
  })
})
