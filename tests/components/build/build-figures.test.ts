import { flushPromises } from '@vue/test-utils'
import { describe, expect, it } from 'vitest'
import { buildPlanSchema } from '@shared/schemas/build'
import type { PublicTank } from '@shared/schemas/tanks'
import BuildFiguresCard from '@/components/build/BuildFiguresCard.vue'
import { PLAN_60, TANK_60 } from '../../helpers/build-plan'
import { mountView } from '../mount'

const tank = { id: 1, name: 'Lounge 60', kind: 'planted', dimensions: TANK_60, targets: {} } as unknown as PublicTank

async function mountCard(plan: object) {
  const { wrapper } = await mountView(BuildFiguresCard, { props: { tank, draft: buildPlanSchema.parse(plan) } })
  await flushPromises()
  return wrapper
}

describe('BuildFiguresCard', () => {
  it('shows the worked figures of the 60 × 30 × 36 cm plan with the three cautions', async () => {
    // Worked by hand in tests/unit/build: 47.48 L, 75 W, 23.74 mL, 81.7 kg.
    const wrapper = await mountCard(PLAN_60)
    expect(wrapper.find('[data-test="figure-water"]').text()).toBe('47.5 L')
    expect(wrapper.find('[data-test="figure-heater"]').text()).toMatch(/^75 W suggested/)
    expect(wrapper.find('[data-test="figure-conditioner"]').text()).toBe('23.7 mL for 47.5 L')
    expect(wrapper.find('[data-test="figure-weight"]').text()).toMatch(/^about 82 kg/)
    expect(wrapper.find('[data-test="caution-weight"]').text()).toContain('structural engineer')
    expect(wrapper.find('[data-test="caution-electric"]').text()).toContain('licensed electrician')
    expect(wrapper.find('[data-test="caution-label"]').text()).toContain('product label')
    wrapper.unmount()
  })

  it('says what is wrong instead of figures when the plan cannot be worked out', async () => {
    const wrapper = await mountCard({
      ...PLAN_60,
      substrate: [
        { material: 'sand', depthCm: 20 },
        { material: 'gravel', depthCm: 20 },
      ],
    })
    expect(wrapper.text()).toContain('the layers add up to 40 cm')
    expect(wrapper.find('[data-test="figure-water"]').exists()).toBe(false)
    wrapper.unmount()
  })
})
