import { describe, expect, it } from 'vitest'
import * as chemistry from '@shared/chemistry'

describe('shared/chemistry index', () => {
  it.each([
    'oxygenSolubilityMgL',
    'percentSaturation',
    'footprintCm2',
    'grossVolumeLitres',
    'waterVolumeLitres',
    'filledWeightKg',
    'planWaterChange',
    'doseForVolume',
    'temperatureMismatchAdvice',
    'unionisedAmmoniaFraction',
    'unionisedAmmoniaMgL',
    'co2FromPhKh',
    'co2RuleOfThumb',
    'compensateTo25C',
    'tdsFromConductivity',
    'heaterWattsRuleOfThumb',
    'energyToHeatKJ',
    'hoursToHeat',
    'waterDensityKgPerL',
  ])('re-exports %s', (name) => {
    expect(typeof (chemistry as Record<string, unknown>)[name]).toBe('function')
  })
})
