import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import { reactive } from 'vue'
import { buildPlanSchema } from '@shared/schemas/build'
import { setClockStyle } from '@shared/time'
import BuildPlanForm from '@/components/build/BuildPlanForm.vue'
import { PLAN_60 } from '../../helpers/build-plan'
import { mountView } from '../mount'

afterEach(() => setClockStyle('24h'))

describe('BuildPlanForm', () => {
  it('shows the light times on the organisation clock and reads a typed time back into the plan', async () => {
    setClockStyle('12h')
    const draft = reactive(buildPlanSchema.parse(PLAN_60))
    const { wrapper } = await mountView(BuildPlanForm, { props: { draft } })
    const on = wrapper.find('input[name="lightOn"]')
    expect((on.element as HTMLInputElement).value).toBe('11:00 am')
    const off = wrapper.find('input[name="lightOff"]')
    await off.setValue('7:30 pm')
    await off.trigger('blur')
    await flushPromises()
    expect(draft.light).toEqual({ on: '11:00', off: '19:30' })
    wrapper.unmount()
  })
})
