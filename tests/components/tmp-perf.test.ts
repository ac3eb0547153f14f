import { flushPromises } from '@vue/test-utils'
import { it, vi } from 'vitest'
import { defineComponent, h } from 'vue'
import WallTile from '@/components/wall/WallTile.vue'
import { NOW, wallTank } from './fixtures/wall'
import { mountView } from './mount'

for (const trend of [false, true, false, true]) {
  it(`24 tiles trend=${trend}`, async () => {
    const Many = defineComponent({ render: () => Array.from({ length: 24 }, (_, i) => h(WallTile, { tank: wallTank(i + 1), now: NOW, showTrend: trend })) })
    const t0 = performance.now()
    await mountView(Many)
    await flushPromises()
    console.info(`trend=${trend}: ${(performance.now() - t0).toFixed(0)} ms`)
  })
}
