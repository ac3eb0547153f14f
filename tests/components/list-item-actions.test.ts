import { afterEach, describe, expect, it } from 'vitest'
import { defineComponent, h } from 'vue'
import { VBtn, VList } from 'vuetify/components'
import ListItemWithActions from '@/components/common/ListItemWithActions.vue'
import { mountView } from './mount'
import { restoreViewport, viewportWidth } from './viewport'

afterEach(restoreViewport)

const Item = defineComponent({
  render: () =>
    h(VList, () =>
      h(
        ListItemWithActions,
        { 'data-test': 'item' },
        { default: () => h('span', { class: 'words' }, 'Marrowfen shop floor'), actions: () => h(VBtn, { class: 'edit' }, () => 'Edit') },
      ),
    ),
})

describe('a list item with buttons', () => {
  it('keeps the buttons at the end of the line on a wide screen', async () => {
    viewportWidth(1280)
    const { wrapper } = await mountView(Item)
    const item = wrapper.find('[data-test=item]')
    expect(item.find('.v-list-item__append .edit').exists()).toBe(true)
    expect(item.find('[data-test=actions-below]').exists()).toBe(false)
    wrapper.unmount()
  })

  it('puts the buttons under the words on a phone, so the words keep the width', async () => {
    viewportWidth(390)
    const { wrapper } = await mountView(Item)
    const item = wrapper.find('[data-test=item]')
    expect(item.find('[data-test=actions-below] .edit').exists()).toBe(true)
    expect(item.find('.v-list-item__append').exists()).toBe(false)
    expect(item.find('.words').text()).toBe('Marrowfen shop floor')
    wrapper.unmount()
  })
})
