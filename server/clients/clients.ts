import { Op } from 'sequelize'
import type { ClientDetail, ClientInput, PublicClient } from '@shared/schemas/clients'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'
import type { Client, Tank } from '../models'

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

type TankWithSite = Tank & { site?: { id: number; name: string } }

/** The row as the API answers it (see its Public… type in shared/schemas). */
function presentClient(client: Client, tanks: TankWithSite[]): PublicClient {
  const live = tanks.filter((t) => !t.archivedAt)
  const sites = new Map(live.map((t) => [t.siteId, t.site?.name ?? '']))
  return {
    id: client.id,
    kind: client.kind,
    name: client.name,
    contactName: client.contactName,
    email: client.email,
    phone: client.phone,
    address: client.address,
    notes: client.notes,
    archivedAt: iso(client.archivedAt),
    tankCount: live.length,
    sites: [...sites].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name)),
    createdAt: client.createdAt.toISOString(),
  }
}

export const clientsService = perContext((ctx: AppContext) => {
  const { models } = ctx

  async function find(actor: UserActor, id: number) {
    const client = await models.Client.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!client) throw notFound('Client not found')
    return client
  }

  async function tanksOf(clientIds: number[]) {
    if (!clientIds.length) return [] as TankWithSite[]
    return (await models.Tank.findAll({
      where: { clientId: { [Op.in]: clientIds } },
      include: [{ association: 'site', attributes: ['id', 'name'] }],
      order: [['name', 'ASC']],
    })) as TankWithSite[]
  }

  async function detail(client: Client): Promise<ClientDetail> {
    const tanks = await tanksOf([client.id])
    const people = await models.User.findAll({ where: { clientId: client.id }, order: [['name', 'ASC']] })
    return {
      ...presentClient(client, tanks),
      tanks: tanks.map((t) => ({ id: t.id, name: t.name, siteId: t.siteId, siteName: t.site?.name ?? '', archived: !!t.archivedAt })),
      people: people.map((p) => ({ id: p.id, name: p.name, email: p.email, active: p.active })),
    }
  }

  return {
    find,

    async list(actor: UserActor, includeArchived: boolean) {
      const clients = await models.Client.findAll({
        where: { organizationId: actor.organizationId, ...(includeArchived ? {} : { archivedAt: null }) },
        order: [['name', 'ASC']],
      })
      const tanks = await tanksOf(clients.map((c) => c.id))
      return clients.map((c) =>
        presentClient(
          c,
          tanks.filter((t) => t.clientId === c.id),
        ),
      )
    },

    async get(actor: UserActor, id: number) {
      return detail(await find(actor, id))
    },

    async create(actor: UserActor, input: ClientInput) {
      const client = await models.Client.create({ ...input, organizationId: actor.organizationId })
      return detail(client)
    },

    async update(actor: UserActor, id: number, changes: Partial<ClientInput>) {
      const client = await find(actor, id)
      await client.update(changes)
      return detail(client)
    },

    async setArchived(actor: UserActor, id: number, archived: boolean) {
      const client = await find(actor, id)
      await client.update({ archivedAt: archived ? new Date() : null })
      return detail(client)
    },
  }
})
