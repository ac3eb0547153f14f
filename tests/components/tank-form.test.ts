import { flushPromises } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import type { TankInput } from '@shared/schemas/tanks'
import TankForm from '@/components/tanks/TankForm.vue'
import { BACK_FISH_ROOM } from './fixtures/site'
import { mountView } from './mount'

const site = BACK_FISH_ROOM

async function mountForm() {
  const { wrapper } = await mountView(TankForm, { props: { sites: [site] } })
  const form = wrapper.findComponent(TankForm)
  const fill = async (name: string, value: string) => {
    await wrapper.find(`input[name="${name}"]`).setValue(value)
  }
  const submit = async () => {
    await wrapper.find('form').trigger('submit')
    await flushPromises()
  }
  const messagesFor = (name: string) => wrapper.find(`input[name="${name}"]`).element.closest('.v-input')?.querySelector('.v-messages')?.textContent?.trim()
  return { wrapper, form, fill, submit, messagesFor }
}

describe('TankForm', () => {
  it('shows field messages for an empty name and a negative length, and emits nothing', async () => {
    const { form, fill, submit, messagesFor } = await mountForm()
    await fill('lengthCm', '-20')
    await fill('widthCm', '40')
    await fill('heightCm', '50')
    await submit()

    expect(messagesFor('name')).toBe('required')
    expect(messagesFor('lengthCm')).toBe('must be above zero')
    expect(messagesFor('widthCm')).toBe('')
    expect(form.emitted('submit')).toBeUndefined()
  })

  it('refuses a heater whose top is above the tank', async () => {
    const { form, fill, submit, messagesFor } = await mountForm()
    await fill('name', 'Display 1')
    await fill('lengthCm', '100')
    await fill('widthCm', '40')
    await fill('heightCm', '50')
    await fill('heaterWatts', '150')
    await fill('heaterTopCm', '60')
    await submit()

    expect(messagesFor('heaterTopCm')).toBe('the heater top cannot be above the tank')
    expect(form.emitted('submit')).toBeUndefined()
  })

  it('shows the gross volume live and emits a valid payload for good input', async () => {
    const { wrapper, form, fill, submit } = await mountForm()
    await fill('name', '  Show tank 3 ')
    await fill('lengthCm', '100')
    await fill('widthCm', '40')
    await fill('heightCm', '50')
    // 100 × 40 × 50 cm = 200 000 cm³ = 200 L, since 1 L = 1 dm³ = 1000 cm³
    // (The International System of Units, BIPM, 9th edition 2019, Table 8).
    expect(wrapper.find('[data-test="gross-volume"]').text()).toContain('200.0 L')

    await fill('heaterWatts', '150')
    await fill('setPointC', '25.5')
    await fill('heaterTopCm', '30')
    await submit()

    const emitted = form.emitted('submit')
    expect(emitted).toHaveLength(1)
    const payload = emitted![0]![0] as TankInput
    expect(payload).toMatchObject({
      name: 'Show tank 3',
      siteId: 3,
      kind: 'tropical_freshwater',
      stage: 'cycling',
      dimensions: { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 },
      volumeLitres: null,
      substrateDepthCm: 0,
      heater: { watts: 150, setPointC: 25.5, topCm: 30 },
      lightSchedule: { on: '09:00', off: '17:00' },
    })
    // Prefilled from the tropical-freshwater defaults in shared/schemas/tank-defaults.
    expect(payload.targets?.temperature).toEqual({ min: 24, max: 28 })
    expect(payload.targets?.ph).toEqual({ min: 6.5, max: 7.5 })
    expect(payload.targets?.nitrate).toEqual({ min: 0, max: 40 })
  })

  it('switches the dimension fields with the shape', async () => {
    const { wrapper } = await mountForm()
    expect(wrapper.find('input[name="diameterCm"]').exists()).toBe(false)
    const cylinder = wrapper.findAll('button').find((b) => b.text() === 'Cylinder')!
    await cylinder.trigger('click')
    expect(wrapper.find('input[name="diameterCm"]').exists()).toBe(true)
    expect(wrapper.find('input[name="lengthCm"]').exists()).toBe(false)
    expect(wrapper.find('input[name="bowCm"]').exists()).toBe(false)
  })

  it('shows the safety notes by the heater and the dimensions', async () => {
    const { wrapper } = await mountForm()
    const text = wrapper.text()
    expect(text).toContain('Heaters and pumps belong on a residual-current device with drip loops')
    expect(text).toContain('A filled tank weighs about 1 kg per litre plus glass and substrate')
  })
})
