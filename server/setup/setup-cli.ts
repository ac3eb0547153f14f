// `npm run setup -- --business … --owner … --email … --password-file … --site …`: the setup page
// for scripted installs. The password is read from a file or from standard input (`-`), never
// from the command line, where other users of the machine could read it in the process list.
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { setupInputSchema } from '@shared/schemas/setup'
import { closeContext, createContext } from '../bootstrap'
import { loadConfig } from '../config'
import { migrate } from '../platform/db/migrate'
import { AppError } from '../platform/errors'
import { setupService } from './setup'

const USAGE = `Usage: DATABASE_URL=postgres://… npm run setup -- --business NAME --owner NAME --email ADDRESS --password-file FILE|- --site NAME [--time-zone ZONE]
  --password-file -   reads the password from standard input (first line)
  --time-zone         an IANA zone such as Europe/Berlin; defaults to this machine's zone`

function fail(message: string, code = 2): never {
  console.error(message)
  process.exit(code)
}

const { values } = parseArgs({
  options: {
    business: { type: 'string' },
    owner: { type: 'string' },
    email: { type: 'string' },
    'password-file': { type: 'string' },
    site: { type: 'string' },
    'time-zone': { type: 'string' },
    help: { type: 'boolean' },
  },
  strict: true,
})
if (values.help) fail(USAGE, 0)
if (!values['password-file']) fail(`--password-file is required (a file, or - for standard input)\n${USAGE}`)
if (!process.env.DATABASE_URL) fail(`DATABASE_URL is not set.\n${USAGE}`)

const passwordFile = values['password-file']
const password = readFileSync(passwordFile === '-' ? 0 : passwordFile, 'utf8').split(/\r?\n/)[0]
const parsed = setupInputSchema.safeParse({
  businessName: values.business,
  ownerName: values.owner,
  email: values.email,
  password,
  siteName: values.site,
  timeZone: values['time-zone'] ?? Intl.DateTimeFormat().resolvedOptions().timeZone,
})
if (!parsed.success) {
  const flags: Record<string, string> = {
    businessName: '--business',
    ownerName: '--owner',
    email: '--email',
    password: '--password-file',
    siteName: '--site',
    timeZone: '--time-zone',
  }
  fail(parsed.error.issues.map((i) => `${flags[String(i.path[0])] ?? i.path.join('.')}: ${i.message}`).join('\n') + `\n${USAGE}`)
}

const ctx = createContext({ ...loadConfig(), logLevel: 'silent' })
try {
  await migrate(ctx.sequelize)
  const owner = await setupService(ctx).createBusiness(parsed.data)
  console.log(`Set up "${parsed.data.businessName}" with its first site "${parsed.data.siteName}". Sign in as ${owner.email}.`)
} catch (error) {
  process.exitCode = error instanceof AppError && error.status === 409 ? 3 : 1
  console.error(error instanceof Error ? error.message : String(error))
} finally {
  await closeContext(ctx)
}
