import type { MetricKey } from '@shared/metrics/registry'
import { defaultTargetsFor } from '@shared/schemas/tank-defaults'
import {
  tankInputSchema,
  tankShapeSchema,
  type PublicTank,
  type TankInput,
  type TankKind,
  type TankShapeInput,
  type TankStage,
  type Targets,
} from '@shared/schemas/tanks'
import { fieldErrors, friendlyIssues, type FieldErrors } from '@/composables/useFieldErrors'

export type ShapeKind = TankShapeInput['shape']
/** What the inputs hold: text, so an empty box stays empty instead of becoming 0. */
type NumberText = string

export interface BandDraft {
  metric: MetricKey
  min: NumberText
  max: NumberText
}

export interface TankDraft {
  name: string
  siteId: number | null
  clientId: number | null
  kind: TankKind
  stage: TankStage
  volumeMode: 'dimensions' | 'entered'
  shape: ShapeKind
  lengthCm: NumberText
  widthCm: NumberText
  heightCm: NumberText
  diameterCm: NumberText
  bowCm: NumberText
  volumeLitres: NumberText
  substrateDepthCm: NumberText
  hasHeater: boolean
  heaterWatts: NumberText
  setPointC: NumberText
  heaterTopCm: NumberText
  hasLightSchedule: boolean
  lightOn: string
  lightOff: string
  filter: string
  media: string
  notes: string
  bands: BandDraft[]
}

const text = (value: number | null | undefined): NumberText => (value == null ? '' : String(value))

export function bandsFrom(targets: Targets): BandDraft[] {
  return Object.entries(targets)
    .filter(([, band]) => band != null)
    .map(([metric, band]) => ({ metric: metric as MetricKey, min: text(band?.min), max: text(band?.max) }))
}

export function emptyDraft(kind: TankKind = 'tropical_freshwater', siteId: number | null = null): TankDraft {
  return {
    name: '',
    siteId,
    clientId: null,
    kind,
    stage: 'cycling',
    volumeMode: 'dimensions',
    shape: 'rectangular',
    lengthCm: '',
    widthCm: '',
    heightCm: '',
    diameterCm: '',
    bowCm: '',
    volumeLitres: '',
    substrateDepthCm: '0',
    hasHeater: kind !== 'coldwater',
    heaterWatts: '',
    setPointC: kind === 'coldwater' ? '' : '25',
    heaterTopCm: '',
    hasLightSchedule: true,
    lightOn: '09:00',
    lightOff: '17:00',
    filter: '',
    media: '',
    notes: '',
    bands: bandsFrom(defaultTargetsFor(kind)),
  }
}

export function draftFromTank(tank: PublicTank): TankDraft {
  const dims = tank.dimensions
  return {
    ...emptyDraft(tank.kind, tank.siteId),
    name: tank.name,
    clientId: tank.clientId,
    stage: tank.stage,
    volumeMode: dims ? 'dimensions' : 'entered',
    shape: dims?.shape ?? 'rectangular',
    lengthCm: dims && 'lengthCm' in dims ? text(dims.lengthCm) : '',
    widthCm: dims && 'widthCm' in dims ? text(dims.widthCm) : '',
    heightCm: text(dims?.heightCm),
    diameterCm: dims?.shape === 'cylinder' ? text(dims.diameterCm) : '',
    bowCm: dims?.shape === 'bow_front' ? text(dims.bowCm) : '',
    volumeLitres: dims ? '' : text(tank.volumeLitres),
    substrateDepthCm: text(tank.substrateDepthCm),
    hasHeater: tank.heater != null,
    heaterWatts: text(tank.heater?.watts),
    setPointC: text(tank.heater?.setPointC),
    heaterTopCm: text(tank.heater?.topCm),
    hasLightSchedule: tank.lightSchedule != null,
    lightOn: tank.lightSchedule?.on ?? '09:00',
    lightOff: tank.lightSchedule?.off ?? '17:00',
    filter: tank.filter,
    media: tank.media,
    notes: tank.notes,
    bands: bandsFrom(tank.targets),
  }
}

/** '' → undefined so the schema reports "required"; anything else as a number (NaN if garbled). */
function num(value: NumberText): number | undefined {
  const trimmed = String(value ?? '').trim()
  return trimmed === '' ? undefined : Number(trimmed)
}

export function shapeFromDraft(draft: TankDraft): Record<string, unknown> {
  switch (draft.shape) {
    case 'rectangular':
      return { shape: 'rectangular', lengthCm: num(draft.lengthCm), widthCm: num(draft.widthCm), heightCm: num(draft.heightCm) }
    case 'cylinder':
      return { shape: 'cylinder', diameterCm: num(draft.diameterCm), heightCm: num(draft.heightCm) }
    case 'bow_front':
      return {
        shape: 'bow_front',
        lengthCm: num(draft.lengthCm),
        widthCm: num(draft.widthCm),
        bowCm: num(draft.bowCm),
        heightCm: num(draft.heightCm),
      }
  }
}

/** The dimensions when they are complete and valid, for the live volume. */
export function completeShape(draft: TankDraft): TankShapeInput | null {
  if (draft.volumeMode !== 'dimensions') return null
  const parsed = tankShapeSchema.safeParse(shapeFromDraft(draft))
  return parsed.success ? parsed.data : null
}

export function candidateFromDraft(draft: TankDraft): Record<string, unknown> {
  const targets: Record<string, unknown> = {}
  for (const band of draft.bands) {
    // A band left wholly empty is dropped; half-filled ones go through to be reported.
    if (band.min.trim() === '' && band.max.trim() === '') continue
    targets[band.metric] = { min: num(band.min), max: num(band.max) }
  }
  const byDimensions = draft.volumeMode === 'dimensions'
  return {
    name: draft.name,
    siteId: draft.siteId ?? undefined,
    clientId: draft.clientId,
    kind: draft.kind,
    stage: draft.stage,
    dimensions: byDimensions ? shapeFromDraft(draft) : null,
    volumeLitres: byDimensions ? null : (num(draft.volumeLitres) ?? null),
    substrateDepthCm: num(draft.substrateDepthCm) ?? 0,
    heater: draft.hasHeater ? { watts: num(draft.heaterWatts), setPointC: num(draft.setPointC), topCm: num(draft.heaterTopCm) } : null,
    filter: draft.filter,
    media: draft.media,
    lightSchedule: draft.hasLightSchedule ? { on: draft.lightOn, off: draft.lightOff } : null,
    targets,
    notes: draft.notes,
  }
}

export type DraftResult = { ok: true; input: TankInput } | { ok: false; errors: FieldErrors }

export function validateDraft(draft: TankDraft): DraftResult {
  const candidate = candidateFromDraft(draft)
  const parsed = tankInputSchema.safeParse(candidate, { error: friendlyIssues })
  if (parsed.success) return { ok: true, input: parsed.data }
  const errors = fieldErrors(parsed.error)
  // An unchosen site arrives as undefined, which the generic map calls "required".
  if (errors.siteId === 'required') errors.siteId = 'choose a site'
  return { ok: false, errors }
}
