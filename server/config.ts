import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { join, resolve } from 'node:path'
import { z } from 'zod'

const boolish = z
  .enum(['1', '0', 'true', 'false', 'yes', 'no'])
  .transform((v) => v === '1' || v === 'true' || v === 'yes')

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  DATABASE_URL: z.string().url('DATABASE_URL must be a postgres:// URL'),
  DATA_DIR: z.string().default('.data'),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
  ACCESS_TOKEN_HOURS: z.coerce.number().positive().max(24 * 30).default(12),
  PUBLIC_URL: z.string().url().optional(),
  SEED_DEMO: boolish.default(false),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  SIGN_IN_LIMIT: z.coerce.number().int().positive().default(10),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  SERVE_CLIENT: boolish.default(true),
  MQTT_URL: z.string().url().optional(),
  MQTT_HOST: z.string().default('127.0.0.1'),
  MQTT_PORT: z.coerce.number().int().min(0).max(65535).default(1883),
  MQTT_WS_PORT: z.coerce.number().int().min(0).max(65535).optional(),
  MAX_FUTURE_SECONDS: z.coerce.number().int().min(0).max(86400).default(300),
  MAX_READING_AGE_DAYS: z.coerce.number().int().min(1).max(3650).default(400),
  RAW_RETENTION_DAYS: z.coerce.number().int().min(1).max(3650).default(90),
  RULES_TICK_SECONDS: z.coerce.number().positive().max(300).default(10),
  ESCALATE_ALARM_MINUTES: z.coerce.number().positive().max(1440).default(15),
  ESCALATE_WARNING_MINUTES: z.coerce.number().positive().max(1440).default(60),
  REPEAT_MINUTES: z.coerce.number().positive().max(1440).default(30),
  BCRYPT_ROUNDS: z.coerce.number().int().min(4).max(15).default(11),
  SMTP_URL: z.string().url('SMTP_URL must be an smtp:// or smtps:// URL').optional(),
  FAKE_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  MAIL_FROM: z.string().min(3).default('Tankwarden <alerts@tankwarden.invalid>'),
  IMPORT_MAX_MB: z.coerce.number().positive().max(10_000).default(100),
})

export type Config = Readonly<{
  env: 'development' | 'production' | 'test'
  host: string
  port: number
  databaseUrl: string
  dataDir: string
  jwtSecret: string
  accessTokenHours: number
  publicUrl: string
  seedDemo: boolean
  logLevel: string
  signInLimit: number
  signInWindowMinutes: number
  serveClient: boolean
  bcryptRounds: number
  mqtt: { url?: string; host: string; port: number; wsPort?: number }
  readingLimits: { maxFutureSeconds: number; maxAgeDays: number }
  rawRetentionDays: number
  rulesTickMs: number
  alertTiming: { escalateAlarmAfterMinutes: number; escalateWarningAfterMinutes: number; repeatEveryMinutes: number }
  mail: { smtpUrl?: string; fakeSmtpPort: number; from: string }
  imports: { maxMb: number }
}>

/** The JWT secret is generated once and kept in the data folder when not configured. */
function persistentSecret(dataDir: string): string {
  const file = join(dataDir, 'jwt-secret')
  if (existsSync(file)) return readFileSync(file, 'utf8').trim()
  mkdirSync(dataDir, { recursive: true })
  const secret = randomBytes(48).toString('base64url')
  writeFileSync(file, secret, { mode: 0o600 })
  return secret
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = envSchema.safeParse(env)
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`)
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`)
  }
  const e = parsed.data
  const dataDir = resolve(e.DATA_DIR)
  return Object.freeze({
    env: e.NODE_ENV,
    host: e.HOST,
    port: e.PORT,
    databaseUrl: e.DATABASE_URL,
    dataDir,
    jwtSecret: e.JWT_SECRET ?? persistentSecret(dataDir),
    accessTokenHours: e.ACCESS_TOKEN_HOURS,
    publicUrl: e.PUBLIC_URL ?? `http://${e.HOST === '0.0.0.0' ? '127.0.0.1' : e.HOST}:${e.PORT}`,
    seedDemo: e.SEED_DEMO,
    logLevel: e.LOG_LEVEL,
    signInLimit: e.SIGN_IN_LIMIT,
    signInWindowMinutes: e.SIGN_IN_WINDOW_MINUTES,
    serveClient: e.SERVE_CLIENT,
    bcryptRounds: e.BCRYPT_ROUNDS,
    mqtt: { url: e.MQTT_URL, host: e.MQTT_HOST, port: e.MQTT_PORT, wsPort: e.MQTT_WS_PORT },
    readingLimits: { maxFutureSeconds: e.MAX_FUTURE_SECONDS, maxAgeDays: e.MAX_READING_AGE_DAYS },
    rawRetentionDays: e.RAW_RETENTION_DAYS,
    rulesTickMs: e.RULES_TICK_SECONDS * 1000,
    alertTiming: { escalateAlarmAfterMinutes: e.ESCALATE_ALARM_MINUTES, escalateWarningAfterMinutes: e.ESCALATE_WARNING_MINUTES, repeatEveryMinutes: e.REPEAT_MINUTES },
    mail: { smtpUrl: e.SMTP_URL, fakeSmtpPort: e.FAKE_SMTP_PORT, from: e.MAIL_FROM },
    imports: { maxMb: e.IMPORT_MAX_MB },
  })
}

/** A config for tests: everything explicit, nothing read from the environment but what is passed. */
export function testConfig(overrides: Partial<Config> & { databaseUrl: string }): Config {
  return Object.freeze({
    env: 'test',
    host: '127.0.0.1',
    port: 0,
    dataDir: resolve('.test-data'),
    jwtSecret: 'test-secret-that-is-long-enough-for-hs256-signing',
    accessTokenHours: 12,
    publicUrl: 'http://127.0.0.1:0',
    seedDemo: false,
    logLevel: 'silent',
    signInLimit: 10,
    signInWindowMinutes: 15,
    serveClient: false,
    bcryptRounds: 4,
    mqtt: { host: '127.0.0.1', port: 0 },
    readingLimits: { maxFutureSeconds: 300, maxAgeDays: 400 },
    rawRetentionDays: 90,
    rulesTickMs: 10_000,
    alertTiming: { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 },
    mail: { fakeSmtpPort: 0, from: 'Tankwarden <alerts@tankwarden.invalid>' },
    imports: { maxMb: 100 },
    ...overrides,
  })
}
