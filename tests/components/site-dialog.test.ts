import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import { setClockStyle } from '@shared/time'
import SiteDialog from '@/components/sites/SiteDialog.vue'
import { BACK_FISH_ROOM } from './fixtures/site'
import { mountView } from './mount'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)
const site = { ...BACK_FISH_ROOM, workdayEnd: '19:30', tankCount: 4 }

async function typeEnd(text: string) {
  const input = inDocument('input[name="workdayEnd"]')
  await input.setValue(text)
  await input.trigger('blur')
  await flushPromises()
}

afterEach(() => {
  setClockStyle('24h')
  document.body.innerHTML = ''
})

describe('the site dialog', () => {
  it('shows when the working day ends on the organisation clock and saves what was typed as HH:MM', async () => {
    setClockStyle('12h')
    const { wrapper } = await mountView(SiteDialog, { props: { modelValue: true, site } })
    await flushPromises()
    const input = document.querySelector('input[name="workdayEnd"]') as HTMLInputElement
    expect(input.value).toBe('7:30 pm')
    expect(input.placeholder).toBe('6:00 pm')
    await typeEnd('5 pm')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    const dialog = wrapper.findComponent(SiteDialog)
    expect(dialog.emitted('save')?.[0]?.[0]).toMatchObject({ name: 'Back fish room', workdayEnd: '17:00' })
  })

  it('saves an emptied field as no end of its own (18:00 then applies)', async () => {
    const { wrapper } = await mountView(SiteDialog, { props: { modelValue: true, site } })
    await flushPromises()
    await typeEnd('')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(wrapper.findComponent(SiteDialog).emitted('save')?.[0]?.[0]).toMatchObject({ workdayEnd: null })
  })
})
