import { QueryTypes } from 'sequelize'
import bcrypt from 'bcryptjs'
import { hashSecret, newSecretToken } from '../access/tokens'
import type { AppContext } from '../context'
import { badRequest } from '../platform/errors'
import { enqueueMail } from '../mail'
import { passwordReset } from '../mail'
import { perContext } from '../platform/per-context'

export const RESET_MINUTES = 60

/** Every refusal is a 400 on `token`; the field says which kind, so the page can offer a new link. */
const resetRefused = (message: string, field: 'unknown' | 'already used' | 'expired') => badRequest(message, { token: field })

/** Password resets by mail: a single-use link valid for an hour; the answer never says whether the e-mail exists. */
export const passwordResetService = perContext((ctx: AppContext) => {
  const { models, sequelize, config } = ctx
  return {
    async request(email: string) {
      const user = await models.User.findOne({ where: { email: email.toLowerCase(), active: true } })
      if (!user) return
      const { token, hash } = newSecretToken()
      await sequelize.transaction(async (transaction) => {
        await sequelize.query(`INSERT INTO password_resets (user_id, token_hash, expires_at) VALUES ($1, $2, $3)`, {
          bind: [user.id, hash, new Date(Date.now() + RESET_MINUTES * 60_000)],
          transaction,
        })
        const mail = passwordReset({ link: `${config.publicUrl}/reset-password?token=${token}`, validMinutes: RESET_MINUTES })
        await enqueueMail(
          ctx,
          { kind: 'password_reset', to: user.email, ...mail, organizationId: user.organizationId, dedupeKey: `reset:${hash}` },
          { transaction },
        )
      })
    },

    async confirm(token: string, password: string) {
      await sequelize.transaction(async (transaction) => {
        const [row] = await sequelize.query<{ id: number; user_id: number; expires_at: Date; used_at: Date | null }>(
          `SELECT id, user_id, expires_at, used_at FROM password_resets WHERE token_hash = $1 FOR UPDATE`,
          { bind: [hashSecret(token)], type: QueryTypes.SELECT, transaction },
        )
        // Whoever holds the token already knows it existed, so saying which of the three it is leaks nothing.
        if (!row) throw resetRefused('This reset link is not known; check that the whole link was copied, or ask for a new one', 'unknown')
        if (row.used_at) throw resetRefused('This reset link has already been used; ask for a new one', 'already used')
        if (row.expires_at.getTime() <= Date.now()) {
          throw resetRefused(`This reset link has expired (they last ${RESET_MINUTES} minutes); ask for a new one`, 'expired')
        }
        await sequelize.query(`UPDATE password_resets SET used_at = now() WHERE id = $1`, { bind: [row.id], transaction })
        await models.User.update({ passwordHash: await bcrypt.hash(password, config.bcryptRounds) }, { where: { id: row.user_id }, transaction })
        // A new password ends every session.
        await models.Session.update({ revokedAt: new Date() }, { where: { userId: row.user_id, revokedAt: null }, transaction })
      })
    },
  }
})
