import { describe, expect, it } from 'vitest'
import WallTile from '@/components/wall/WallTile.vue'
import { NOW, wallTank } from '../fixtures/wall'
import { mountView } from '../mount'

async function tile(buildDay: { day: number; aboutDays: number | null } | null | undefined) {
  const { wrapper } = await mountView(WallTile, { props: { tank: wallTank(4, { buildDay }), now: NOW, timeZone: 'Europe/Berlin', showTrend: false } })
  return wrapper
}

describe('WallTile build line', () => {
  it('says where a tank being built stands', async () => {
    expect((await tile({ day: 9, aboutDays: 28 })).find('[data-test="tile-build-day"]').text()).toBe('Build day 9 of about 28')
    expect((await tile({ day: 3, aboutDays: null })).find('[data-test="tile-build-day"]').text()).toBe('Build day 3')
  })

  it('shows nothing for a tank that is not being built', async () => {
    expect((await tile(null)).find('[data-test="tile-build-day"]').exists()).toBe(false)
    expect((await tile(undefined)).find('[data-test="tile-build-day"]').exists()).toBe(false)
  })
})
