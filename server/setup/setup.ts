import { randomBytes, timingSafeEqual } from 'node:crypto'
import { isIP } from 'node:net'
import bcrypt from 'bcryptjs'
import type { SessionInfo } from '@shared/schemas/auth'
import type { SetupInput, SetupState } from '@shared/schemas/setup'
import type { AppContext } from '../context'
import { AppError, conflict } from '../platform/errors'
import { authService } from '../people'

/** One code per running instance, made on first use and printed at start; never stored. */
const codes = new WeakMap<AppContext, string>()
// No 0/O or 1/I/L: the code is read off a terminal and typed by hand.
const CODE_ALPHABET = 'ABCDEFGHJKMNPQRSTUVWXYZ23456789'
/** Any number will do; it only keeps two setups from running at once. */
const SETUP_LOCK = 7411007

export function setupCodeFor(ctx: AppContext): string {
  let code = codes.get(ctx)
  if (!code) {
    const bytes = randomBytes(8)
    const chars = [...bytes].map((b) => CODE_ALPHABET[b % CODE_ALPHABET.length])
    code = `${chars.slice(0, 4).join('')}-${chars.slice(4).join('')}`
    codes.set(ctx, code)
  }
  return code
}

/** The server's own machine: 127.0.0.0/8 or ::1, also when written as an IPv4-mapped IPv6 address. */
export function isLoopback(address: string | undefined): boolean {
  if (!address) return false
  const plain = address.startsWith('::ffff:') ? address.slice(7) : address
  if (isIP(plain) === 4) return plain.startsWith('127.')
  return plain === '::1'
}

function codeMatches(ctx: AppContext, given: string | undefined): boolean {
  if (!given) return false
  const expected = Buffer.from(setupCodeFor(ctx))
  const actual = Buffer.from(given.trim().toUpperCase())
  return actual.length === expected.length && timingSafeEqual(actual, expected)
}

const alreadySetUp = () => conflict('already_set_up', 'This installation is already set up; sign in instead')

export function setupService(ctx: AppContext) {
  const { models, sequelize } = ctx

  const isNeeded = async () => (await models.Organization.count()) === 0

  /** Creates the business, its owner and its first site; refused once any organisation exists. */
  async function createBusiness(input: Omit<SetupInput, 'code'>) {
    if (!(await isNeeded())) throw alreadySetUp()
    const passwordHash = await bcrypt.hash(input.password, ctx.config.bcryptRounds)
    const owner = await sequelize.transaction(async (transaction) => {
      await sequelize.query('SELECT pg_advisory_xact_lock($1)', { bind: [SETUP_LOCK], transaction })
      if ((await models.Organization.count({ transaction })) > 0) throw alreadySetUp()
      const org = await models.Organization.create({ name: input.businessName }, { transaction })
      await models.Site.create({ organizationId: org.id, name: input.siteName, timeZone: input.timeZone }, { transaction })
      return models.User.create({ organizationId: org.id, email: input.email, name: input.ownerName, role: 'owner', passwordHash }, { transaction })
    })
    ctx.logger.info({ organizationId: owner.organizationId }, 'installation set up')
    return owner
  }

  return {
    isNeeded,
    createBusiness,

    async state(callerAddress: string | undefined): Promise<SetupState> {
      return { needed: await isNeeded(), codeRequired: !isLoopback(callerAddress) }
    },

    /** The setup page: away from the server's machine only with its printed code; the owner is signed in. */
    async run(input: SetupInput, callerAddress: string | undefined): Promise<SessionInfo> {
      if (!(await isNeeded())) throw alreadySetUp()
      if (!isLoopback(callerAddress) && !codeMatches(ctx, input.code)) {
        throw new AppError(403, 'setup_code', 'From another machine, enter the setup code the server printed in its terminal', {
          code: 'not the printed setup code',
        })
      }
      return authService(ctx).openSession(await createBusiness(input))
    },
  }
}
