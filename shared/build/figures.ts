// Every computed figure of a build plan, from the tank's inside shape and the plan.
import { grossVolumeLitres, type TankShape } from '../chemistry/volume'
import type { LabelRate } from '../chemistry/water-change'
import { conditionerDose, ELECTRICAL_CAUTIONS, heaterTopMaxCm, LABEL_CAUTION, suggestHeaterWatts } from './equipment'
import { checkStockingPlan, livestockBands, stockingLoad, type PlannedGroup } from './stocking'
import { substrateFigures, type SubstrateLayer } from './substrate'
import { hardscapeFigures, waterLeftLitres, type HardscapeItem } from './water'
import { filledTankWeight, WEIGHT_CAUTIONS } from './weight'

export interface BuildFiguresInput {
  shape: TankShape
  kind: string
  fillHeightCm: number
  glassThicknessMm: number
  roomC: number
  setPointC: number
  substrate: readonly SubstrateLayer[]
  hardscape: readonly HardscapeItem[]
  labelRate: LabelRate | null
  targets: { temperature?: { min: number; max: number }; ph?: { min: number; max: number } }
  groups: readonly PlannedGroup[]
}

export function buildFigures(input: BuildFiguresInput) {
  const substrate = substrateFigures(input.shape, input.substrate)
  const hardscape = hardscapeFigures(input.hardscape)
  const waterLitres = waterLeftLitres(input.shape, input.fillHeightCm, substrate.depthCm, hardscape.litres)
  const weight = filledTankWeight({
    shape: input.shape,
    glassThicknessMm: input.glassThicknessMm,
    waterLitres,
    substrateLitres: substrate.litres,
    substrateKg: substrate.kg,
    hardscapeKg: hardscape.kg,
  })
  return {
    substrate,
    hardscape,
    waterLitres,
    weight,
    heater: {
      ...suggestHeaterWatts(waterLitres, input.setPointC, input.roomC),
      topMaxCm: heaterTopMaxCm(input.shape, input.fillHeightCm, substrate.depthCm),
      minTopCm: substrate.depthCm,
    },
    conditioner: input.labelRate ? conditionerDose(waterLitres, input.labelRate) : null,
    stocking: {
      checks: checkStockingPlan({ kind: input.kind, tankLitres: grossVolumeLitres(input.shape), waterLitres, targets: input.targets }, input.groups),
      load: stockingLoad(input.groups, waterLitres),
      bands: livestockBands(input.groups),
    },
    cautions: { weight: WEIGHT_CAUTIONS, electrical: ELECTRICAL_CAUTIONS, label: LABEL_CAUTION },
  }
}
export type BuildFigures = ReturnType<typeof buildFigures>
