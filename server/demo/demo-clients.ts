import { QueryTypes } from 'sequelize'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { photosService } from '../photos'
import { closeVisit } from '../visits'
import { tankScenePng } from './demo-history/photos'
import { addDays, formatLocalDate, localDateAt, localToInstant } from '@shared/time/zoned'

/**
 * The tank-care side of the invented demo business: two clients whose tanks stand at their own
 * sites, yesterday's visits closed with their reports, and today's round. Every name is made up.
 */
export const DEMO_CLIENTS = [
  {
    key: 'harbour',
    kind: 'company',
    name: 'Harbourlight Dental Practice',
    contactName: 'Selma Quayle',
    email: 'frontdesk@harbourlight.example',
    phone: '+49 30 5550 1234 (invented)',
    address: '3 Quay Road (invented)',
    notes: 'Key from reception; visits before the first patient where possible.',
  },
  {
    key: 'alder',
    kind: 'person',
    name: 'Ingrid Palesworth',
    contactName: '',
    email: 'ingrid@palesworth.example',
    phone: '+49 30 5550 9876 (invented)',
    address: '27 Alder Close (invented)',
    notes: 'Cat in the house: keep the lid on.',
  },
] as const
export type DemoClientKey = (typeof DEMO_CLIENTS)[number]['key']

/** A client's person who signs in to see the practice's tanks and visit reports. */
export const DEMO_CLIENT_USER = { email: 'selma@harbourlight.example', name: 'Selma Quayle', client: 'harbour' as DemoClientKey }

const DEMO_TECHNICIAN = 'keeper@marrowfen.example'

type Stop = { site: string; tanks: string[]; client: DemoClientKey; hour: number }
/** Yesterday's visits, both closed, and today's round, in order. */
const YESTERDAY: Stop[] = [
  { site: 'Harbourlight — Quay Road surgery', tanks: ['Waiting room reef'], client: 'harbour', hour: 8 },
  { site: 'Palesworth home', tanks: ['Living room community tank'], client: 'alder', hour: 14 },
]
const TODAY: Stop[] = [
  { site: 'Harbourlight — Quay Road surgery', tanks: ['Waiting room reef'], client: 'harbour', hour: 8 },
  { site: 'Harbourlight — Mill Lane clinic', tanks: ['Mill Lane lobby tank'], client: 'harbour', hour: 11 },
  { site: 'Palesworth home', tanks: ['Living room community tank'], client: 'alder', hour: 15 },
]

/** Seeds the visits once the month's history is in: yesterday's are closed as a technician would have. */
export async function seedDemoVisits(ctx: AppContext, clientIds: Map<DemoClientKey, number>, now = Date.now()) {
  const { models } = ctx
  const technician = (await models.User.findOne({ where: { email: DEMO_TECHNICIAN } }))!
  const actor: UserActor = { kind: 'user', userId: technician.id, organizationId: technician.organizationId, role: 'keeper', siteIds: null, sessionId: 'seed' }
  const sites = new Map((await models.Site.findAll()).map((s) => [s.name, s]))
  const tanks = new Map((await models.Tank.findAll()).map((t) => [t.name, t]))
  const plan = async (stop: Stop, dayOffset: number) => {
    const site = sites.get(stop.site)!
    const day = addDays(localDateAt(site.timeZone, now), dayOffset)
    return models.Visit.create({
      organizationId: technician.organizationId,
      clientId: clientIds.get(stop.client)!,
      siteId: site.id,
      technicianId: technician.id,
      startsAt: new Date(localToInstant(site.timeZone, day, stop.hour * 60)),
      endsAt: new Date(localToInstant(site.timeZone, day, (stop.hour + 1) * 60)),
      tankIds: stop.tanks.map((name) => tanks.get(name)!.id),
      notes: 'Check the heater guard and the lid seal.',
    })
  }
  const photos = photosService(ctx)
  for (const stop of YESTERDAY) {
    const visit = await plan(stop, -1)
    const zone = sites.get(stop.site)!.timeZone
    const day = formatLocalDate(localDateAt(zone, visit.startsAt.getTime()))
    const arrivedAt = new Date(visit.startsAt.getTime() + 5 * 60_000)
    const leftAt = new Date(arrivedAt.getTime() + 50 * 60_000)
    const tank = tanks.get(stop.tanks[0]!)!
    const photo = await photos.upload(actor, tank.id, await tankScenePng(tank.kind, `${tank.name}@visit`), {
      caption: 'After the visit: glass clean, water clear',
      takenAt: new Date(leftAt.getTime() - 10 * 60_000).toISOString(),
    })
    // The kit test the month's care already holds for that day is the one taken on the visit.
    const kits = await models.TestKitEntry.findAll({ where: { tankId: tank.id, deletedAt: null } })
    const kit = kits.find((k) => formatLocalDate(localDateAt(zone, k.takenAt.getTime())) === day)
    await closeVisit(
      ctx,
      actor,
      visit.id,
      {
        arrivedAt: arrivedAt.toISOString(),
        leftAt: leftAt.toISOString(),
        notes: 'All livestock eating; a little green algae on the back glass, lights trimmed by half an hour.',
        materials: [
          { what: 'water changed', amount: Math.round(tank.volumeLitres * 0.2), unit: 'L' },
          { what: 'filter floss replaced', amount: 1, unit: 'pad' },
        ],
        photoIds: [photo.id],
        tanks: [{ tankId: tank.id, doneTaskIds: [], kitEntryId: kit?.id ?? null, notes: '' }],
      },
      new Date(leftAt.getTime() + 60_000),
      { sendReport: false },
    )
    // The care the month's record already has for that tank that day was done on this visit.
    const done = await ctx.sequelize.query<{ id: number; title: string }>(
      `SELECT c.id, c.title FROM care_log l JOIN care_tasks c ON c.id = l.care_task_id
       WHERE l.tank_id = $1 AND l.kind = 'task_done' AND l.at >= $2 AND l.at < $3 ORDER BY l.at`,
      {
        bind: [
          tank.id,
          new Date(localToInstant(zone, localDateAt(zone, visit.startsAt.getTime()), 0)),
          new Date(localToInstant(zone, addDays(localDateAt(zone, visit.startsAt.getTime()), 1), 0)),
        ],
        type: QueryTypes.SELECT,
      },
    )
    const closed = (await models.Visit.findByPk(visit.id))!
    await closed.update({ work: closed.work.map((w) => (w.tankId === tank.id ? { ...w, doneTasks: done.map((d) => ({ id: d.id, title: d.title })) } : w)) })
  }
  for (const stop of TODAY) await plan(stop, 0)
}
