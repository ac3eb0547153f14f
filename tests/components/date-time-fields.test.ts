import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import { defineComponent, h, ref } from 'vue'
import { setClockStyle } from '@shared/time'
import DateField from '@/components/common/DateField.vue'
import DateTimeField from '@/components/common/DateTimeField.vue'
import TimeField from '@/components/common/TimeField.vue'
import { mountView } from './mount'

/** A field in a host that keeps its model, so the test reads what a form would get. */
async function mountField(field: typeof DateField | typeof TimeField | typeof DateTimeField, start: string) {
  const value = ref(start)
  const Host = defineComponent({
    render: () => h(field, { label: 'From', name: 'from', modelValue: value.value, 'onUpdate:modelValue': (v: string) => (value.value = v) }),
  })
  const { wrapper } = await mountView(Host)
  return { wrapper, value }
}

async function type(wrapper: Awaited<ReturnType<typeof mountField>>['wrapper'], selector: string, text: string) {
  const input = wrapper.find(selector)
  await input.setValue(text)
  await input.trigger('blur')
  await flushPromises()
  return input.element as HTMLInputElement
}

afterEach(() => setClockStyle('24h'))

describe('the shared date and time fields', () => {
  it('shows a day in the product words, reads a typed day back, and keeps a day it cannot read out of the model', async () => {
    const { wrapper, value } = await mountField(DateField, '2026-03-03')
    const input = wrapper.find('input[name="from"]').element as HTMLInputElement
    expect(input.type).toBe('text')
    expect(input.value).toBe('Tue 3 Mar 2026')
    expect((await type(wrapper, 'input[name="from"]', '25/12/2026')).value).toBe('Fri 25 Dec 2026')
    expect(value.value).toBe('2026-12-25')
    await type(wrapper, 'input[name="from"]', '31 Feb 2026')
    expect(value.value).toBe('2026-12-25')
    expect(wrapper.text()).toContain('Type a day such as 3 Mar 2026')
    expect(wrapper.find('button[aria-label="From: choose on a calendar"]').exists()).toBe(true)
  })

  it('shows and reads a time on a 12-hour clock when the organisation chose one', async () => {
    setClockStyle('12h')
    const { wrapper, value } = await mountField(TimeField, '15:05')
    expect((wrapper.find('input[name="from"]').element as HTMLInputElement).value).toBe('3:05 pm')
    expect((await type(wrapper, 'input[name="from"]', '7:30 am')).value).toBe('7:30 am')
    expect(value.value).toBe('07:30')
    expect((await type(wrapper, 'input[name="from"]', '21:15')).value).toBe('9:15 pm')
    expect(value.value).toBe('21:15')
  })

  it('keeps a moment as the day and time forms already send, from two labelled parts', async () => {
    const { wrapper, value } = await mountField(DateTimeField, '2026-03-03T15:05')
    expect(wrapper.find('[role="group"][aria-label="From"]').exists()).toBe(true)
    expect((wrapper.find('input[name="from"]').element as HTMLInputElement).value).toBe('Tue 3 Mar 2026')
    expect((wrapper.find('input[name="fromTime"]').element as HTMLInputElement).value).toBe('15:05')
    await type(wrapper, 'input[name="fromTime"]', '6:40 am')
    expect(value.value).toBe('2026-03-03T06:40')
    await type(wrapper, 'input[name="from"]', '4 Mar 2026')
    expect(value.value).toBe('2026-03-04T06:40')
  })
})
