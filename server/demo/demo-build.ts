// One demo tank mid-build: filled eight days ago (build day 9 of about 28), the first steps
// ticked on their days, and daily test-kit readings showing the cycle under way. Invented data.
import { buildPlanSchema } from '@shared/schemas/build'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { buildsService } from '../builds'
import { tanksService } from '../tanks'
import { testKitService } from '../test-kit'

export const DEMO_BUILD_TANK = 'Studio build 60'
const DAY_MS = 86_400_000
const HOUR_MS = 3_600_000
/** Build day the demo stands on: filled this many days ago, plus one. */
export const DEMO_BUILD_DAY = 9

const PLAN = buildPlanSchema.parse({
  fillHeightCm: 34,
  glassThicknessMm: 6,
  roomC: 20,
  filter: { name: 'Hang-on filter, 300 L/h', media: ['Coarse sponge', 'Ceramic rings', 'Fine sponge', 'Carbon'] },
  heater: { watts: null, setPointC: 26, topCm: null },
  light: { on: '11:00', off: '19:00' },
  substrate: [
    { material: 'mineral_base', depthCm: 1 },
    { material: 'nutrient_soil', depthCm: 4, bagLitres: 3 },
    { material: 'gravel', depthCm: 1, bagLitres: 2 },
  ],
  hardscape: [
    { kind: 'rock', kg: 5, label: 'Grey stone' },
    { kind: 'wood', kg: 1.1, label: 'Branch root' },
  ],
  water: {
    conditioner: 'Tap-water conditioner',
    labelRate: { amount: 5, unit: 'mL', per: '10L' },
    startPh: 7.6,
    temperature: { min: 24, max: 26 },
    ph: { min: 6.8, max: 7.2 },
  },
  plants: true,
  stocking: [
    { label: 'Harlequin rasboras', settleDays: 14, groups: [{ speciesKey: 'harlequin_rasbora', count: 6 }] },
    { label: 'Cherry shrimp', settleDays: 14, groups: [{ speciesKey: 'cherry_shrimp', count: 6 }] },
  ],
  notes: 'Client studio, reception wall. Stand checked level; socket on an RCD circuit.',
})

/** Invented daily readings of the first nine days: ammonia up then down, nitrite climbing. */
const READINGS: Array<{ day: number; values: Record<string, number> }> = [
  { day: 2, values: { ph: 7.4, temperature: 25.8 } },
  { day: 3, values: { ph: 7.2, ammonia: 0.25, nitrite: 0, temperature: 26.0 } },
  { day: 4, values: { ammonia: 0.5, nitrite: 0, temperature: 26.1 } },
  { day: 5, values: { ammonia: 1.0, nitrite: 0.1, temperature: 26.0 } },
  { day: 6, values: { ammonia: 1.5, nitrite: 0.25, ph: 7.1, temperature: 26.0 } },
  { day: 7, values: { ammonia: 1.0, nitrite: 0.5, temperature: 25.9 } },
  { day: 8, values: { ammonia: 0.5, nitrite: 1.0, nitrate: 5, temperature: 26.0 } },
  { day: 9, values: { ammonia: 0.25, nitrite: 1.0, nitrate: 10, ph: 7.0, temperature: 26.1 } },
]
const UNITS: Record<string, string> = { ph: 'pH', temperature: 'C', ammonia: 'mg/L', nitrite: 'mg/L', nitrate: 'mg/L' }

/**
 * Seeds the mid-build tank on `siteId` as `actor` (an owner or keeper), dated back from `now`;
 * answers the tank's id. Does nothing (answers null) when the site already has a tank of that name.
 */
export async function seedDemoBuild(ctx: AppContext, options: { actor: UserActor; siteId: number; now?: Date }): Promise<number | null> {
  const { actor, siteId } = options
  const now = options.now ?? new Date()
  if (await ctx.models.Tank.findOne({ where: { siteId, name: DEMO_BUILD_TANK } })) return null
  const site = await ctx.models.Site.findByPk(siteId)
  const timeZone = site?.timeZone ?? 'UTC'
  const tank = await tanksService(ctx).create(actor, {
    name: DEMO_BUILD_TANK,
    siteId,
    kind: 'planted',
    stage: 'empty',
    dimensions: { shape: 'rectangular', lengthCm: 60, widthCm: 30, heightCm: 36 },
    volumeLitres: null,
    substrateDepthCm: 0,
    heater: null,
    filter: '',
    media: '',
    lightSchedule: null,
    notes: 'Being built for a client: see its Build page.',
    sortOrder: 90,
  })
  const builds = buildsService(ctx)
  await builds.savePlan(actor, tank.id, PLAN, now)
  const filledAt = now.getTime() - (DEMO_BUILD_DAY - 1) * DAY_MS
  await builds.start(actor, tank.id, { filledOn: formatLocalDate(localDateAt(timeZone, filledAt)) }, now)
  // Each reading and tick falls on its build day at the time of day of `now` (a tick an hour later).
  const onDay = (day: number, hours = 0) => new Date(filledAt + (day - 1) * DAY_MS + hours * HOUR_MS)
  const kit = testKitService(ctx)
  for (const r of READINGS) {
    const takenAt = onDay(r.day)
    if (takenAt.getTime() > now.getTime()) continue
    await kit.create(actor, tank.id, {
      takenAt: takenAt.toISOString(),
      values: Object.entries(r.values).map(([metric, value]) => ({ metric: metric as never, value, unit: UNITS[metric] as string })),
      notes: r.day === 6 ? 'Ammonia peak; water slightly cloudy' : '',
    })
  }
  const ticks: Array<[string, number, string]> = [
    ['conditioner', 1, '24 mL of conditioner for the fill'],
    ['heater_check', 2, 'Holding 25.8 °C; set point nudged'],
    ['ph', 3, 'pH 7.2 reached'],
    ['plants', 3, 'Stem plants and mosses in'],
  ]
  for (const [key, day, notes] of ticks) {
    await builds.tick(actor, tank.id, key, { at: onDay(day, 1).toISOString(), notes }, now)
  }
  // The daily cycling test was ticked off in the care list with each reading: due again tomorrow.
  const cycling = await ctx.models.BuildStep.findOne({ where: { tankId: tank.id, key: 'cycling' } })
  const lastTest = onDay(READINGS.filter((r) => onDay(r.day).getTime() <= now.getTime()).at(-1)?.day ?? 1)
  if (cycling?.careTaskId) await ctx.models.CareTask.update({ lastDoneAt: lastTest, lastDoneBy: actor.userId }, { where: { id: cycling.careTaskId } })
  return tank.id
}
