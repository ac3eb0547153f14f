// The demo's stock: batches followed from quarantine to the sales row and out of the door,
// equipment on the show tanks (one lamp past its yearly change) and each site's consumables
// (one test-kit reagent past its date). Invented data, dated from `now`.
import { formatLocalDate, localDateAt, addDays, type LocalDate } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { consumablesService, equipmentService } from '../equipment'
import { batchMovesService } from '../livestock'
import { careTasksService, livestockService } from '../care'

const DAY_MS = 86_400_000
const ZONE = 'Europe/Berlin'

/** A local date `days` back on the demo's calendar. */
const daysAgo = (now: number, days: number) => formatLocalDate(addDays(localDateAt(ZONE, now), -days))
/** A local date `months` back, on a day every month has. */
function monthsAgo(now: number, months: number): string {
  const today: LocalDate = localDateAt(ZONE, now)
  const total = today.year * 12 + (today.month - 1) - months
  return formatLocalDate({ year: Math.floor(total / 12), month: (total % 12) + 1, day: Math.min(today.day, 28) })
}
const at = (now: number, days: number) => new Date(now - days * DAY_MS).toISOString()

export async function seedDemoStock(ctx: AppContext, actor: UserActor, now = Date.now()) {
  const tanks = new Map((await ctx.models.Tank.findAll()).map((t) => [t.name, t]))
  const sites = new Map((await ctx.models.Site.findAll()).map((s) => [s.name, s.id]))
  const tankId = (name: string) => tanks.get(name)!.id

  // A batch through quarantine: 24 arrive, 2 are lost, 16 go to the sales row, 5 of those are sold.
  const livestock = livestockService(ctx)
  const moves = batchMovesService(ctx)
  const tetras = await livestock.add(actor, tankId('Quarantine Q1'), {
    speciesKey: 'neon_tetra',
    count: 24,
    addedAt: at(now, 33),
    source: 'Lowmoor Aquatics wholesale (invented)',
    notes: 'Two bags, one box',
  })
  await moves.lose(actor, tetras.entry.id, { count: 2, cause: 'Found dead on day 2, no marks', at: at(now, 31) })
  const onSale = await moves.move(actor, tetras.entry.id, { toTankId: tankId('Sales row A1'), count: 16, at: at(now, 4), confirm: true })
  await moves.out(actor, onSale.moved.id, { outcome: 'sold', count: 5, destination: 'Walk-in customer', at: at(now, 1) })
  // A group that went out whole to a client's tank.
  const danios = await livestock.add(actor, tankId('Quarantine Q1'), {
    speciesKey: 'zebra_danio',
    count: 10,
    addedAt: at(now, 40),
    source: 'Fenbrook breeder (invented)',
    notes: '',
  })
  await moves.out(actor, danios.entry.id, { outcome: 'to_client', destination: 'Harbour Dental (invented), waiting-room tank', at: at(now, 8) })

  const equipment = equipmentService(ctx)
  const tasks = careTasksService(ctx)
  const put = (tank: string, input: Parameters<typeof equipment.create>[2]) => equipment.create(actor, tankId(tank), input)
  /** Older equipment has had its service on time: last done `days` ago. */
  const serviced = async (piece: { careTaskId: number | null }, days: number) =>
    piece.careTaskId && tasks.markDone(actor, piece.careTaskId, { at: at(now, days), notes: '', values: {} })
  await serviced(
    await put('Display 1 — community', {
      kind: 'heater',
      name: 'Main heater',
      model: 'Glass heater, adjustable',
      watts: 200,
      installedOn: monthsAgo(now, 27),
      notes: '',
    }),
    9,
  )
  // The one lamp due: its yearly tube change is a month overdue.
  await put('Display 1 — community', { kind: 'lamp', name: 'Front lamp', model: 'T5 tube 895 mm', watts: 39, installedOn: monthsAgo(now, 13), notes: '' })
  await put('Display 1 — community', {
    kind: 'filter',
    name: 'Canister filter',
    model: 'External canister, 1 200 L/h',
    watts: 15,
    installedOn: daysAgo(now, 60),
    notes: '',
  })
  await put('Reef display', { kind: 'pump', name: 'Return pump', model: 'DC return pump', watts: 35, installedOn: daysAgo(now, 50), notes: '' })
  await put('Reef display', { kind: 'probe', name: 'pH probe', model: 'Glass electrode', watts: null, installedOn: daysAgo(now, 20), notes: '' })
  await serviced(
    await put('Reef display', { kind: 'heater', name: 'Sump heater', model: 'Titanium heater', watts: 300, installedOn: monthsAgo(now, 8), notes: '' }),
    16,
  )
  await serviced(
    await put('Breeding cylinder C1', {
      kind: 'heater',
      name: 'Cylinder heater',
      model: 'Glass heater',
      watts: 100,
      installedOn: monthsAgo(now, 40),
      notes: '',
    }),
    22,
  )

  const supplies = consumablesService(ctx)
  const shop = sites.get('Marrowfen shop floor')!
  const fishroom = sites.get('Cedar Row fish room')!
  await supplies.create(actor, shop, { kind: 'salt', name: 'Reef salt', unit: 'kg', quantity: 18, lowAt: 5, expiresOn: null, notes: '' })
  const carbon = await supplies.create(actor, shop, { kind: 'carbon', name: 'Activated carbon', unit: 'l', quantity: 4, lowAt: 1, expiresOn: null, notes: '' })
  await supplies.create(actor, shop, {
    kind: 'reagent',
    name: 'Nitrite test reagent',
    unit: 'ml',
    quantity: 40,
    lowAt: 10,
    expiresOn: daysAgo(now, 12),
    notes: '',
  })
  await supplies.create(actor, shop, {
    kind: 'reagent',
    name: 'Ammonia test reagent 1',
    unit: 'ml',
    quantity: 55,
    lowAt: 10,
    expiresOn: daysAgo(now, -300),
    notes: '',
  })
  await supplies.create(actor, fishroom, { kind: 'filter_media', name: 'Coarse sponge pads', unit: 'pads', quantity: 2, lowAt: 3, expiresOn: null, notes: '' })
  // Display 1's media change uses carbon from here on.
  await ctx.models.CareTask.update(
    { consumableId: carbon.id, consumableAmount: 0.25 },
    { where: { tankId: tankId('Display 1 — community'), kind: 'media_replace' } },
  )
}
