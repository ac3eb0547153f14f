import { describe, expect, it } from 'vitest'
import { moveWarnings } from '@shared/livestock/move-check'

// The half-unit pH gap and the 2 °C gap are `common practice`. The mixed pH averages [H⁺]
// (pH = −log₁₀ a(H⁺), IUPAC Compendium of Chemical Terminology): one to one at the end of
// the plan, −log₁₀((10^−8.2 + 10^−7.0) / 2) = 7.28, worked by hand.
const base = { targetName: 'Sales 3', targetStage: 'established', openIncidents: [], from: {}, to: {} }

describe('warnings before a move', () => {
  it('is quiet when the water matches and nothing is open', () => {
    expect(moveWarnings({ ...base, from: { ph: 7.2, tempC: 25 }, to: { ph: 7.0, tempC: 26.5 } })).toEqual([])
  })

  it('names open incidents, cycling, and the pH and temperature gaps', () => {
    const warnings = moveWarnings({
      ...base,
      targetStage: 'cycling',
      openIncidents: [{ title: 'pH below 6.5' }],
      from: { ph: 8.2, tempC: 22 },
      to: { ph: 7.0, tempC: 26 },
    })
    expect(warnings.map((w) => w.code)).toEqual(['open_incident', 'tank_cycling', 'ph_gap', 'temperature_gap'])
    expect(warnings[2]!.message).toBe(
      'pH 8.2 here, 7.0 in Sales 3 (1.2 apart): acclimate over 30 minutes; the container reads about pH 7.3 when the animals are netted across',
    )
    expect(warnings[3]!.message).toBe('22.0 °C here, 26.0 °C in Sales 3: float the container until the two are close')
  })

  it('leaves out a gap it cannot know', () => {
    expect(moveWarnings({ ...base, from: { ph: 8.2 }, to: {} })).toEqual([])
  })
})
