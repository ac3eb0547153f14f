import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { reactive } from 'vue'
import { describe, expect, it, vi } from 'vitest'

vi.mock('@/api/equipment')

import { listConsumables } from '@/api/equipment'
import CareTaskDialog from '@/components/care/CareTaskDialog.vue'
import { mountView } from '../mount'
import { careTask } from './fixtures'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)

describe('a care task that uses up a supply', () => {
  it("offers the site's supplies and sends the one chosen with its amount", async () => {
    vi.mocked(listConsumables).mockResolvedValue([
      { id: 4, siteId: 3, kind: 'salt', name: 'Reef salt', unit: 'kg', quantity: 12, lowAt: 2, expiresOn: null, notes: '', low: false, expired: false },
    ])
    const task = careTask(8, { kind: 'water_change', consumableId: 4, consumableAmount: 1.5 })
    // The dialog opens after mounting, as it does on the page.
    const props = reactive({ open: false, task, siteId: 3 })
    const { wrapper } = await mountView(CareTaskDialog, { role: 'owner', props })
    props.open = true
    await flushPromises()
    expect(listConsumables).toHaveBeenCalledWith(3)
    expect(inDocument('[data-test="task-consumable"]').text()).toContain('Reef salt (kg)')
    await inDocument('input[name="consumableAmount"]').setValue('2')
    await inDocument('.v-dialog form').trigger('submit')
    expect(wrapper.findComponent(CareTaskDialog).emitted('update')?.[0]).toEqual([8, expect.objectContaining({ consumableId: 4, consumableAmount: 2 })])
  })

  it('leaves the choice out where the site has no supplies', async () => {
    vi.mocked(listConsumables).mockResolvedValue([])
    const props = reactive({ open: false, task: null, siteId: 3 })
    await mountView(CareTaskDialog, { role: 'owner', props })
    props.open = true
    await flushPromises()
    expect(document.querySelector('[data-test="task-consumable"]')).toBeNull()
  })
})
