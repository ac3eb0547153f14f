import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'

vi.mock('@/api/care')

import { finishWaterChange, listWaterChanges, planWaterChange } from '@/api/care'
import type { PublicWaterChange } from '@shared/schemas/care-api'
import { ApiError } from '@/api/errors'
import WaterChangePanel from '@/components/care/WaterChangePanel.vue'
import { mountView } from '../mount'
import { careTank, heaterExposingPlan } from './fixtures'

// Out-of-range input shows the field's error next to the field: checked in the form before
// sending, and the server's 400 fields (which the form cannot know, such as the tank's size) shown the same way.
const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)
const messagesOf = (root: { find: (s: string) => { element: Element } }, input: string) =>
  (root.find(`input[name="${input}"]`).element.closest('.v-input')?.querySelector('.v-messages')?.textContent ?? '').trim()

const open: PublicWaterChange = {
  id: 55,
  tankId: 12,
  status: 'in_progress',
  plan: heaterExposingPlan,
  heaterOffConfirmed: true,
  temporaryRuleId: 9,
  startedAt: '2026-03-03T10:00:00.000Z',
  startedBy: 7,
  finishedAt: null,
  finishedBy: null,
  litresReplaced: null,
  dechlorinatorMl: null,
  newWaterTempC: null,
  careLogEntryId: null,
  cancelledAt: null,
  cancelledBy: null,
  cancelReason: null,
}

beforeEach(() => {
  vi.mocked(listWaterChanges).mockReset()
  vi.mocked(listWaterChanges).mockResolvedValue([])
  vi.mocked(planWaterChange).mockReset()
  vi.mocked(finishWaterChange).mockReset()
})

async function mountPanel() {
  const { wrapper } = await mountView(WaterChangePanel, { role: 'keeper', props: { tank: careTank, canWrite: true, timeZone: 'UTC' } })
  await flushPromises()
  return wrapper
}

describe('care forms show field errors', () => {
  it('refuses a zero, a negative and an over-100 % amount in the plan form without asking the server', async () => {
    const wrapper = await mountPanel()
    for (const [value, message] of [
      ['0', 'must be above zero'],
      ['-5', 'must be above zero'],
      ['101', 'at most 100 %'],
    ] as const) {
      await wrapper.find('input[name="amount"]').setValue(value)
      await wrapper.find('form').trigger('submit')
      await flushPromises()
      expect(messagesOf(wrapper, 'amount')).toBe(message)
    }
    await wrapper.find('input[name="amount"]').setValue('20')
    await wrapper.find('input[name="newWaterTemp"]').setValue('45')
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(messagesOf(wrapper, 'newWaterTemp')).not.toBe('')
    expect(planWaterChange).not.toHaveBeenCalled()
  })

  it('shows the server’s field error under the amount when the litres exceed the tank', async () => {
    vi.mocked(planWaterChange).mockRejectedValue(
      new ApiError({
        status: 400,
        code: 'invalid_input',
        message: 'litres: more than the 180 L in the tank',
        fields: { litres: 'more than the 180 L in the tank' },
      }),
    )
    const wrapper = await mountPanel()
    await wrapper.find('[data-test="mode-litres"]').trigger('click')
    await wrapper.find('input[name="amount"]').setValue('500')
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    expect(planWaterChange).toHaveBeenCalledWith(12, { litres: 500 })
    expect(messagesOf(wrapper, 'amount')).toBe('more than the 180 L in the tank')
  })

  it('refuses zero litres and a negative dechlorinator dose when finishing', async () => {
    vi.mocked(listWaterChanges).mockResolvedValue([open])
    const wrapper = await mountPanel()
    await wrapper.find('[data-test="water-change-finish"]').trigger('click')
    await flushPromises()
    await inDocument('input[name="litresReplaced"]').setValue('0')
    await inDocument('input[name="dechlorinatorMl"]').setValue('-1')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    const dialog = new DOMWrapper(document.querySelector('.v-dialog')!)
    expect(messagesOf(dialog, 'litresReplaced')).toBe('must be above zero')
    expect(messagesOf(dialog, 'dechlorinatorMl')).not.toBe('')
    expect(finishWaterChange).not.toHaveBeenCalled()
  })
})
