import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { HEATER_OFF_CAUTION, UNPLUG_CAUTION } from '@shared/chemistry/water-change'

vi.mock('@/api/care')

import { cancelWaterChange, finishWaterChange, listWaterChanges, planWaterChange, startWaterChange } from '@/api/care'
import type { PublicWaterChange } from '@shared/schemas/care-api'
import WaterChangePanel from '@/components/care/WaterChangePanel.vue'
import { ApiError } from '@/api/errors'
import { heaterConfirmReason, needsHeaterConfirmation } from '@/components/care/water-change-draft'
import { mountView } from '../mount'
import { careTank, gentlePlan, heaterExposingPlan } from './fixtures'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)

function startedChange(plan = heaterExposingPlan, heaterOffConfirmed = true): PublicWaterChange & { cautions: string[] } {
  return {
    id: 55,
    tankId: 12,
    status: 'in_progress',
    plan,
    heaterOffConfirmed,
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
    cautions: plan.cautions,
  }
}

async function mountPanel(canWrite = true) {
  const { wrapper } = await mountView(WaterChangePanel, { role: canWrite ? 'keeper' : 'viewer', props: { tank: careTank, canWrite, timeZone: 'UTC' } })
  await flushPromises()
  return wrapper
}

async function planPercent(wrapper: Awaited<ReturnType<typeof mountPanel>>, percent: string) {
  await wrapper.find('input[name="amount"]').setValue(percent)
  await wrapper.find('form').trigger('submit')
  await flushPromises()
}

beforeEach(() => {
  vi.mocked(listWaterChanges).mockReset()
  vi.mocked(listWaterChanges).mockResolvedValue([])
  vi.mocked(planWaterChange).mockReset()
  vi.mocked(startWaterChange).mockReset()
  vi.mocked(finishWaterChange).mockReset()
  vi.mocked(cancelWaterChange).mockReset()
})

describe('WaterChangePanel', () => {
  it('shows the plan: litres out, level after, heater exposed, the largest safe change and the cautions verbatim', async () => {
    vi.mocked(planWaterChange).mockResolvedValue(heaterExposingPlan)
    const wrapper = await mountPanel()
    await planPercent(wrapper, '40')
    expect(planWaterChange).toHaveBeenLastCalledWith(12, { percent: 40 })
    expect(wrapper.find('[data-test="plan-litres"]').text()).toBe('72 L (40 % of 180 L)')
    expect(wrapper.find('[data-test="plan-level"]').text()).toBe('27 cm')
    expect(wrapper.find('[data-test="plan-heater"]').text()).toContain('Yes: the heater would be out of the water')
    expect(wrapper.find('[data-test="plan-max"]').text()).toContain('60 L (33.3 %)')
    const cautions = wrapper.findAll('[data-test="plan-cautions"] li').map((li) => li.text())
    expect(cautions).toEqual(heaterExposingPlan.cautions)
  })

  it('cannot start a plan that exposes the heater until "The heater is switched off" is ticked, then sends heaterOffConfirmed', async () => {
    vi.mocked(planWaterChange).mockResolvedValue(heaterExposingPlan)
    vi.mocked(startWaterChange).mockResolvedValue(startedChange())
    const wrapper = await mountPanel()
    await planPercent(wrapper, '40')
    await wrapper.find('[data-test="water-change-start"]').trigger('click')
    await flushPromises()

    const dialog = document.querySelector('[data-test="heater-confirm-dialog"]')
    expect(dialog).not.toBeNull()
    expect(dialog!.textContent).toContain(HEATER_OFF_CAUTION)
    expect(dialog!.textContent).toContain(UNPLUG_CAUTION)
    expect(inDocument('[data-test="heater-confirm-reason"]').text()).toContain('below the top of the heater')
    const startButton = () => document.querySelector('[data-test="heater-confirm-start"]') as HTMLButtonElement
    expect(startButton().disabled).toBe(true)
    startButton().click()
    await flushPromises()
    expect(startWaterChange).not.toHaveBeenCalled()

    await inDocument('[data-test="heater-off-check"] input').setValue(true)
    expect(startButton().disabled).toBe(false)
    startButton().click()
    await flushPromises()
    expect(startWaterChange).toHaveBeenCalledTimes(1)
    expect(startWaterChange).toHaveBeenCalledWith(12, { percent: 40, heaterOffConfirmed: true })
    expect(wrapper.find('[data-test="water-change-in-progress"]').text()).toContain('Water change in progress')
  })

  it('asks for the heater to be off for a change over 25 % even when the heater stays covered', () => {
    // 30 % of 180 L = 54 L = 13.5 cm: level 31.5 cm, still above the 30 cm heater top (hand-worked as in fixtures).
    const bigCovered = { ...gentlePlan, litresOut: 54, percent: 30, levelAfterCm: 31.5, requiresHeaterOffConfirmation: false }
    expect(needsHeaterConfirmation(bigCovered)).toBe(true)
    expect(heaterConfirmReason(bigCovered)).toBe('This change is over 25 % of the water.')
    expect(needsHeaterConfirmation(gentlePlan)).toBe(false)
  })

  it('starts a small change that keeps the heater covered without the dialog', async () => {
    vi.mocked(planWaterChange).mockResolvedValue(gentlePlan)
    vi.mocked(startWaterChange).mockResolvedValue(startedChange(gentlePlan, false))
    const wrapper = await mountPanel()
    await planPercent(wrapper, '10')
    await wrapper.find('[data-test="water-change-start"]').trigger('click')
    await flushPromises()
    expect(document.querySelector('[data-test="heater-confirm-dialog"]')).toBeNull()
    expect(startWaterChange).toHaveBeenCalledWith(12, { percent: 10, heaterOffConfirmed: false })
  })

  it('finishes a change in progress into the care log with litres, dechlorinator and temperature', async () => {
    const { cautions: _c, ...open } = startedChange()
    vi.mocked(listWaterChanges).mockResolvedValue([open])
    vi.mocked(finishWaterChange).mockResolvedValue({
      ...open,
      status: 'finished',
      finishedAt: '2026-03-03T11:00:00.000Z',
      finishedBy: 7,
      litresReplaced: 70,
      cautions: [HEATER_OFF_CAUTION, UNPLUG_CAUTION],
      logEntry: {
        id: 1,
        tankId: 12,
        kind: 'water_change',
        at: '2026-03-03T11:00:00.000Z',
        by: { id: 7, name: 'Pat' },
        text: 'Water change',
        values: { litres: 70 },
        careTaskId: null,
        waterChangeId: 55,
      },
    })
    const wrapper = await mountPanel()
    // Reopened later, the change in progress still shows the plan's cautions.
    expect(wrapper.findAll('[data-test="water-change-started-cautions"] li').map((li) => li.text())).toEqual(heaterExposingPlan.cautions)
    await wrapper.find('[data-test="water-change-finish"]').trigger('click')
    await flushPromises()
    await inDocument('input[name="litresReplaced"]').setValue('70')
    await inDocument('input[name="dechlorinatorMl"]').setValue('14')
    await inDocument('input[name="finishNewWaterTemp"]').setValue('25.5')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(finishWaterChange).toHaveBeenCalledWith(55, { litresReplaced: 70, dechlorinatorMl: 14, newWaterTempC: 25.5, notes: '' })
    expect(wrapper.find('[data-test="water-change-notice"]').text()).toContain('70 L replaced')
    expect(wrapper.findAll('[data-test="water-change-finished-cautions"] li').map((li) => li.text())).toEqual([HEATER_OFF_CAUTION, UNPLUG_CAUTION])
    expect(wrapper.findComponent(WaterChangePanel).emitted('logged')).toHaveLength(1)
  })

  it('reads the list again when someone else finished the change first, and says why', async () => {
    const { cautions: _c, ...open } = startedChange()
    vi.mocked(listWaterChanges)
      .mockResolvedValueOnce([open])
      .mockResolvedValueOnce([{ ...open, status: 'finished', litresReplaced: 60 }])
    vi.mocked(finishWaterChange).mockRejectedValue(
      new ApiError({ status: 409, code: 'not_in_progress', message: 'This water change is no longer in progress' }),
    )
    const wrapper = await mountPanel()
    await wrapper.find('[data-test="water-change-finish"]').trigger('click')
    await flushPromises()
    await inDocument('input[name="litresReplaced"]').setValue('70')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(listWaterChanges).toHaveBeenCalledTimes(2)
    expect(wrapper.find('[data-test="water-change-in-progress"]').exists()).toBe(false)
    expect(wrapper.find('.v-alert').text()).toContain('This water change is no longer in progress')
  })

  it('cancels a change in progress only after the confirmation, with the reason, and says it was not done', async () => {
    const { cautions: _c, ...open } = startedChange()
    vi.mocked(listWaterChanges).mockResolvedValue([open])
    vi.mocked(cancelWaterChange).mockResolvedValue({
      ...open,
      status: 'cancelled',
      cancelledAt: '2026-03-03T10:20:00.000Z',
      cancelledBy: 7,
      cancelReason: 'Bucket cracked',
      temporaryRuleId: null,
      cautions: ['Top the tank back up to its usual level before switching the heater on again', UNPLUG_CAUTION],
      logEntry: {
        id: 2,
        tankId: 12,
        kind: 'note',
        at: '2026-03-03T10:20:00.000Z',
        by: { id: 7, name: 'Pat' },
        text: 'Water change cancelled (not done): Bucket cracked',
        values: {},
        careTaskId: null,
        waterChangeId: 55,
      },
    })
    const wrapper = await mountPanel()
    await wrapper.find('[data-test="water-change-cancel"]').trigger('click')
    await flushPromises()
    // Backing out of the dialog cancels nothing.
    ;(document.querySelector('[data-test="water-change-cancel-keep"]') as HTMLElement).click()
    await flushPromises()
    expect(cancelWaterChange).not.toHaveBeenCalled()

    await wrapper.find('[data-test="water-change-cancel"]').trigger('click')
    await flushPromises()
    await inDocument('input[name="cancelReason"]').setValue('x'.repeat(301))
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(cancelWaterChange).not.toHaveBeenCalled()
    expect(document.querySelector('.v-dialog')!.textContent).toContain('at most 300 characters')

    await inDocument('input[name="cancelReason"]').setValue('Bucket cracked')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(cancelWaterChange).toHaveBeenCalledWith(55, 'Bucket cracked')
    expect(wrapper.find('[data-test="water-change-in-progress"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="water-change-notice"]').text()).toContain('logged as not done')
    expect(wrapper.findComponent(WaterChangePanel).emitted('logged')).toHaveLength(1)
  })

  it('offers no cancel button to a viewer', async () => {
    const { cautions: _c, ...open } = startedChange()
    vi.mocked(listWaterChanges).mockResolvedValue([open])
    const wrapper = await mountPanel(false)
    expect(wrapper.find('[data-test="water-change-in-progress"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="water-change-cancel"]').exists()).toBe(false)
  })
})
