import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { hostname } from 'node:os'
import { join, resolve } from 'node:path'
import { z } from 'zod'

const boolish = z.enum(['1', '0', 'true', 'false', 'yes', 'no']).transform((v) => v === '1' || v === 'true' || v === 'yes')

/**
 * Which proxies may name the client's address in X-Forwarded-For: a hop count, or addresses,
 * subnets and Express's names (`loopback`, `linklocal`, `uniquelocal`), comma-separated. Unset, the
 * header is ignored: anyone could otherwise pick their own address, and with it a fresh sign-in allowance.
 */
const trustProxySchema = z
  .string()
  .trim()
  .refine(
    (v) => !['true', 'yes', '*'].includes(v.toLowerCase()),
    'name the proxy (an address, subnet or loopback) or a hop count; trusting every sender lets anyone choose their address',
  )
  .transform((v): TrustProxy =>
    ['false', 'no', '0', ''].includes(v.toLowerCase())
      ? false
      : /^\d+$/.test(v)
        ? Number(v)
        : v
            .split(',')
            .map((part) => part.trim())
            .filter(Boolean),
  )

/** Express's `trust proxy`: false (ignore X-Forwarded-For), a hop count, or trusted addresses and subnets. */
export type TrustProxy = false | number | string[]

const envSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
    HOST: z.string().default('127.0.0.1'),
    PORT: z.coerce.number().int().min(0).max(65535).default(8080),
    DATABASE_URL: z.string().url('DATABASE_URL must be a postgres:// URL'),
    DATA_DIR: z.string().default('.data'),
    JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
    ACCESS_TOKEN_HOURS: z.coerce
      .number()
      .positive()
      .max(24 * 30)
      .default(12),
    PUBLIC_URL: z.string().url().optional(),
    SEED_DEMO: boolish.default(false),
    LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
    LOG_FORMAT: z.enum(['json', 'pretty']).optional(),
    TRUST_PROXY: trustProxySchema.optional(),
    SIGN_IN_LIMIT: z.coerce.number().int().positive().default(10),
    SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
    SERVE_CLIENT: boolish.default(true),
    MQTT_URL: z.string().url().optional(),
    CLUSTER_FANOUT: boolish.default(true),
    INSTANCE_ID: z
      .string()
      .regex(/^[A-Za-z0-9_.-]{1,40}$/, 'INSTANCE_ID: letters, digits, _ . - (at most 40)')
      .optional(),
    MQTT_HOST: z.string().default('127.0.0.1'),
    MQTT_PORT: z.coerce.number().int().min(0).max(65535).default(1883),
    MQTT_WS_PORT: z.coerce.number().int().min(0).max(65535).optional(),
    MAX_FUTURE_SECONDS: z.coerce.number().int().min(0).max(86400).default(300),
    MAX_READING_AGE_DAYS: z.coerce.number().int().min(1).max(3650).default(400),
    RAW_RETENTION_DAYS: z.coerce.number().int().min(1).max(3650).default(90),
    RULES_TICK_SECONDS: z.coerce.number().positive().max(300).default(10),
    REPORT_SCHEDULE_SECONDS: z.coerce.number().positive().max(3600).default(60),
    ESCALATE_ALARM_MINUTES: z.coerce.number().positive().max(1440).default(15),
    ESCALATE_WARNING_MINUTES: z.coerce.number().positive().max(1440).default(60),
    REPEAT_MINUTES: z.coerce.number().positive().max(1440).default(30),
    // A tank's first alert mail waits this long for other tanks of its site to trip on the same cause.
    SITE_GROUP_WAIT_SECONDS: z.coerce.number().int().min(0).max(600).default(60),
    BCRYPT_ROUNDS: z.coerce.number().int().min(4).max(15).default(11),
    SMTP_URL: z.string().url('SMTP_URL must be an smtp:// or smtps:// URL').optional(),
    FAKE_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
    MAIL_FROM: z.string().min(3).default('Tankwarden <alerts@tankwarden.invalid>'),
    PHOTO_MAX_MB: z.coerce.number().positive().max(200).default(15),
    PHOTO_STORE: z.enum(['local', 's3']).default('local'),
    S3_ENDPOINT: z.string().url('S3_ENDPOINT must be an http(s):// URL').optional(),
    S3_BUCKET: z.string().min(3).max(63).optional(),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_ACCESS_KEY_ID: z.string().min(1).optional(),
    S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
    S3_FORCE_PATH_STYLE: boolish.default(false),
    CARE_DIGEST_HOUR: z.coerce.number().int().min(0).max(23).default(7),
    IMPORT_MAX_MB: z.coerce.number().positive().max(10_000).default(100),
    // Web Push (RFC 8292): who the push services may contact, and the key pair (else made once and kept in DATA_DIR).
    VAPID_SUBJECT: z
      .string()
      .regex(/^(mailto:\S+@\S+|https:\/\/\S+)$/, 'VAPID_SUBJECT must be a mailto: address or an https:// URL')
      .optional(),
    VAPID_PUBLIC_KEY: z
      .string()
      .regex(/^[A-Za-z0-9_-]{87}$/, 'VAPID_PUBLIC_KEY: a P-256 public key, base64url (87 characters)')
      .optional(),
    VAPID_PRIVATE_KEY: z
      .string()
      .regex(/^[A-Za-z0-9_-]{43}$/, 'VAPID_PRIVATE_KEY: a P-256 private key, base64url (43 characters)')
      .optional(),
  })
  .refine((e) => e.PHOTO_STORE !== 's3' || e.S3_BUCKET, { message: 'S3_BUCKET is required when PHOTO_STORE=s3', path: ['S3_BUCKET'] })
  .refine((e) => !e.VAPID_PUBLIC_KEY === !e.VAPID_PRIVATE_KEY, { message: 'set both VAPID keys or neither', path: ['VAPID_PRIVATE_KEY'] })

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
  /** `pretty` for a person at a terminal (the default under NODE_ENV=development), `json` lines otherwise. */
  logFormat: 'json' | 'pretty'
  trustProxy: TrustProxy
  signInLimit: number
  signInWindowMinutes: number
  serveClient: boolean
  bcryptRounds: number
  mqtt: { url?: string; host: string; port: number; wsPort?: number }
  /** Relay events to other instances over LISTEN/NOTIFY; a lone instance may turn it off. */
  clusterFanout: boolean
  /** Names this instance to an external broker (its persistent session) and in logs; stable across restarts. */
  instanceId: string
  readingLimits: { maxFutureSeconds: number; maxAgeDays: number }
  rawRetentionDays: number
  rulesTickMs: number
  /** How often the scheduled-report job looks for reports due. */
  reportScheduleTickMs: number
  incidentTiming: { escalateAlarmAfterMinutes: number; escalateWarningAfterMinutes: number; repeatEveryMinutes: number; siteGroupWaitSeconds?: number }
  mail: { smtpUrl?: string; fakeSmtpPort: number; from: string }
  photos: { maxBytes: number; store: PhotoStoreSettings }
  /** Local hour (site's zone) from which the morning care digest goes out. */
  careDigestHour: number
  imports: { maxMb: number }
  /** Web Push: the VAPID subject, and the key pair when configured (else kept in the data folder, server/push/vapid.ts). */
  push: PushSettings
}>

export type PushSettings = { subject: string; publicKey?: string; privateKey?: string }

/** The contact a push service may use: the sender address of the alert mails, unless VAPID_SUBJECT names one. */
function vapidSubject(subject: string | undefined, mailFrom: string): string {
  if (subject) return subject
  const address = /<([^>]+)>/.exec(mailFrom)?.[1] ?? mailFrom.trim()
  return `mailto:${address}`
}

export type PhotoStoreSettings =
  { kind: 'local' } | { kind: 's3'; endpoint?: string; bucket: string; region: string; accessKeyId?: string; secretAccessKey?: string; forcePathStyle: boolean }

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
    logFormat: e.LOG_FORMAT ?? (e.NODE_ENV === 'development' ? 'pretty' : 'json'),
    trustProxy: e.TRUST_PROXY ?? false,
    signInLimit: e.SIGN_IN_LIMIT,
    signInWindowMinutes: e.SIGN_IN_WINDOW_MINUTES,
    serveClient: e.SERVE_CLIENT,
    bcryptRounds: e.BCRYPT_ROUNDS,
    mqtt: { url: e.MQTT_URL, host: e.MQTT_HOST, port: e.MQTT_PORT, wsPort: e.MQTT_WS_PORT },
    clusterFanout: e.CLUSTER_FANOUT,
    instanceId:
      e.INSTANCE_ID ??
      `${hostname()
        .replace(/[^A-Za-z0-9_.-]/g, '-')
        .slice(0, 30)}-${e.PORT}`,
    readingLimits: { maxFutureSeconds: e.MAX_FUTURE_SECONDS, maxAgeDays: e.MAX_READING_AGE_DAYS },
    rawRetentionDays: e.RAW_RETENTION_DAYS,
    rulesTickMs: e.RULES_TICK_SECONDS * 1000,
    reportScheduleTickMs: e.REPORT_SCHEDULE_SECONDS * 1000,
    incidentTiming: {
      escalateAlarmAfterMinutes: e.ESCALATE_ALARM_MINUTES,
      escalateWarningAfterMinutes: e.ESCALATE_WARNING_MINUTES,
      repeatEveryMinutes: e.REPEAT_MINUTES,
      siteGroupWaitSeconds: e.SITE_GROUP_WAIT_SECONDS,
    },
    mail: { smtpUrl: e.SMTP_URL, fakeSmtpPort: e.FAKE_SMTP_PORT, from: e.MAIL_FROM },
    photos: {
      maxBytes: Math.round(e.PHOTO_MAX_MB * 1024 * 1024),
      store:
        e.PHOTO_STORE === 's3'
          ? {
              kind: 's3' as const,
              endpoint: e.S3_ENDPOINT,
              bucket: e.S3_BUCKET as string,
              region: e.S3_REGION,
              accessKeyId: e.S3_ACCESS_KEY_ID,
              secretAccessKey: e.S3_SECRET_ACCESS_KEY,
              forcePathStyle: e.S3_FORCE_PATH_STYLE,
            }
          : { kind: 'local' as const },
    },
    careDigestHour: e.CARE_DIGEST_HOUR,
    imports: { maxMb: e.IMPORT_MAX_MB },
    push: { subject: vapidSubject(e.VAPID_SUBJECT, e.MAIL_FROM), publicKey: e.VAPID_PUBLIC_KEY, privateKey: e.VAPID_PRIVATE_KEY },
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
    logFormat: 'json',
    trustProxy: false,
    signInLimit: 10,
    signInWindowMinutes: 15,
    serveClient: false,
    bcryptRounds: 4,
    mqtt: { host: '127.0.0.1', port: 0 },
    clusterFanout: true,
    instanceId: `test-${process.pid}-${randomBytes(3).toString('hex')}`,
    readingLimits: { maxFutureSeconds: 300, maxAgeDays: 400 },
    rawRetentionDays: 90,
    rulesTickMs: 10_000,
    reportScheduleTickMs: 60_000,
    incidentTiming: { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 },
    mail: { fakeSmtpPort: 0, from: 'Tankwarden <alerts@tankwarden.invalid>' },
    photos: { maxBytes: 15 * 1024 * 1024, store: { kind: 'local' as const } },
    careDigestHour: 7,
    imports: { maxMb: 100 },
    push: { subject: 'mailto:alerts@tankwarden.invalid' },
    ...overrides,
  })
}
