import { Router } from 'express'
import { QueryTypes } from 'sequelize'
import { idParamsSchema } from '@shared/schemas/common'
import { actorOf } from '../access/middleware'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import { parse } from '../platform/http/validate'

// An owner sees what was sent about their organization, and mail without one (e.g. a password
// reset) only when it went to one of their users: the box is shared by every organization.
const VISIBLE = `(f.organization_id = :org OR (f.organization_id IS NULL AND EXISTS (
  SELECT 1 FROM users u WHERE u.organization_id = :org AND lower(u.email) IN (SELECT lower(x) FROM unnest(f.envelope_to) AS x))))`

const SUMMARY_COLUMNS = `f.id, f.received_at AS "receivedAt", f.organization_id AS "organizationId", f.envelope_from AS "envelopeFrom",
  f.envelope_to AS "envelopeTo", f.subject, f.attachments, f.raw_size AS "rawSize"`

/** The local fake mailbox: what the development mail server received. Mounted only while it runs. */
export function devMailRouter(ctx: AppContext) {
  const router = Router()

  router.get('/', async (req, res) => {
    const items = await ctx.sequelize.query(`SELECT ${SUMMARY_COLUMNS} FROM fake_mailbox f WHERE ${VISIBLE} ORDER BY f.received_at DESC, f.id DESC LIMIT 100`, {
      replacements: { org: actorOf(req).organizationId },
      type: QueryTypes.SELECT,
    })
    res.json({ items })
  })

  router.get('/:id', async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    const [message] = await ctx.sequelize.query(
      `SELECT ${SUMMARY_COLUMNS}, f.text_body AS "textBody", f.html_body AS "htmlBody", f.headers
       FROM fake_mailbox f WHERE f.id = :id AND ${VISIBLE}`,
      { replacements: { id, org: actorOf(req).organizationId }, type: QueryTypes.SELECT },
    )
    if (!message) throw notFound('No such message in the development mailbox')
    res.json(message)
  })

  router.delete('/', async (req, res) => {
    await ctx.sequelize.query(`DELETE FROM fake_mailbox f WHERE ${VISIBLE}`, {
      replacements: { org: actorOf(req).organizationId },
    })
    res.status(204).end()
  })

  return router
}
