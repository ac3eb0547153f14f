import bcrypt from 'bcryptjs'
import type { AppContext } from '../context'
import { tanksService } from '../tanks'
import { seedDemoBuild } from './demo-build'
import { seedDemoCourse } from './demo-course'
import { seedDemoHistory } from './demo-history'
import { seedDemoStock } from './demo-stock'
import { DEMO_ORGANIZATION, DEMO_PASSWORD, DEMO_ROSTER, DEMO_SITES, DEMO_TANKS, DEMO_USERS } from './demo-scenario'
import { DEMO_CLIENT_USER, DEMO_CLIENTS, seedDemoVisits, type DemoClientKey } from './demo-clients'

/**
 * Seeds the demo scenario into an empty database, with a month of its history (see
 * demo-history/); does nothing when any organization exists.
 */
export async function seedDemoIfEmpty(ctx: AppContext): Promise<boolean> {
  const { models, sequelize } = ctx
  if ((await models.Organization.count()) > 0) return false
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, ctx.config.bcryptRounds)
  const clientIds = new Map<DemoClientKey, number>()
  await sequelize.transaction(async (transaction) => {
    const org = await models.Organization.create({ name: DEMO_ORGANIZATION }, { transaction })
    for (const { key, ...client } of DEMO_CLIENTS) clientIds.set(key, (await models.Client.create({ ...client, organizationId: org.id }, { transaction })).id)
    const sites = new Map<string, number>()
    for (const s of DEMO_SITES) {
      const site = await models.Site.create({ organizationId: org.id, name: s.name, timeZone: s.timeZone, address: s.address }, { transaction })
      sites.set(s.key, site.id)
    }
    for (const u of DEMO_USERS) {
      const user = await models.User.create({ organizationId: org.id, email: u.email, name: u.name, role: u.role, passwordHash }, { transaction })
      for (const key of u.sites) await models.UserSite.create({ userId: user.id, siteId: sites.get(key)! }, { transaction })
      for (const shift of DEMO_ROSTER.filter((r) => r.email === u.email)) {
        for (const siteId of sites.values()) {
          await models.DutyShift.create(
            { organizationId: org.id, siteId, userId: user.id, weekday: shift.weekday, startTime: shift.start, endTime: shift.end },
            { transaction },
          )
        }
      }
    }
    const { client, ...person } = DEMO_CLIENT_USER
    await models.User.create({ ...person, organizationId: org.id, role: 'viewer', clientId: clientIds.get(client)!, passwordHash }, { transaction })
  })
  // Tanks go through the service so volumes and default targets are computed as for any user.
  const owner = await models.User.findOne({ where: { email: DEMO_USERS[0].email } })
  const actor = {
    kind: 'user' as const,
    userId: owner!.id,
    organizationId: owner!.organizationId,
    role: 'owner' as const,
    siteIds: null,
    sessionId: 'seed',
  }
  const siteIds = new Map((await models.Site.findAll()).map((s) => [s.name, s.id]))
  const tanks = tanksService(ctx)
  for (const { site, client, ...tank } of DEMO_TANKS) {
    const siteName = DEMO_SITES.find((s) => s.key === site)!.name
    await tanks.create(actor, { ...tank, siteId: siteIds.get(siteName)!, clientId: client ? clientIds.get(client)! : null })
  }
  const history = await seedDemoHistory(ctx)
  ctx.logger.info(history, 'demo history seeded')
  await seedDemoStock(ctx, actor)
  // One tank mid-build, after the history: its own readings are the cycling tests of its timeline.
  const fishRoom = DEMO_SITES.find((s) => s.key === 'fishroom')!
  await seedDemoBuild(ctx, { actor, siteId: siteIds.get(fishRoom.name)! })
  await seedDemoVisits(ctx, clientIds)
  // The quarantine tank on day 4 of a treatment course, its doses and tests in Care today.
  await seedDemoCourse(ctx, { actor })
  return true
}

export const DEMO_SIGN_INS = [...DEMO_USERS, { ...DEMO_CLIENT_USER, role: 'viewer' as const }].map((u) => ({
  email: u.email,
  role: u.role,
  password: DEMO_PASSWORD,
}))
