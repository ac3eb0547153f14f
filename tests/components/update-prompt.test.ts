import { flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import { defineComponent, h, nextTick } from 'vue'
import { createMemoryHistory, createRouter } from 'vue-router'
import UpdatePrompt from '@/components/layout/UpdatePrompt.vue'
import { mountView } from './mount'
import { needRefresh, updateServiceWorker } from './stubs/pwa-register-vue'

const Blank = defineComponent({ render: () => h('div') })
const router = () =>
  createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/tanks', component: Blank },
      { path: '/wall/:siteId', component: Blank, meta: { wall: true } },
    ],
  })

afterEach(() => {
  needRefresh.value = false
  updateServiceWorker.mockClear()
  document.body.innerHTML = ''
})

describe('the update prompt', () => {
  it('says a new version is ready and reloads into it when asked', async () => {
    const { wrapper } = await mountView(UpdatePrompt, { router: router(), path: '/tanks' })
    expect(document.body.textContent).not.toContain('A new version is ready')
    needRefresh.value = true
    await flushPromises()
    await nextTick()
    expect(document.body.textContent).toContain('A new version is ready')
    const reload = [...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Reload')
    expect(reload).toBeDefined()
    reload!.click()
    expect(updateServiceWorker).toHaveBeenCalledWith(true)
    wrapper.unmount()
  })

  it('on a wall, where nobody is there to tap, takes the new version by itself', async () => {
    const { wrapper } = await mountView(UpdatePrompt, { router: router(), path: '/wall/3' })
    needRefresh.value = true
    await flushPromises()
    expect(updateServiceWorker).toHaveBeenCalledWith(true)
    expect(document.body.textContent).not.toContain('A new version is ready')
    wrapper.unmount()
  })
})
