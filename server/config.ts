import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { z } from 'zod'
import { projectRoot } from './project-root'

// .env is optional (tests pass everything through the environment); Node 20 reads it natively.
const envFile = resolve(projectRoot, '.env')
if (existsSync(envFile) && process.env.ENDPLATE_SKIP_ENV_FILE !== '1') process.loadEnvFile(envFile)

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((value) => value === 'true' || value === '1')

/** The values .env.example ships with all start so; none may reach a running server. */
function isPlaceholder(value: string): boolean {
  return value.trim().toLowerCase().startsWith('change-me')
}

/**
 * 32 random bytes, the HS256 key size RFC 7518 §3.2 asks for: 43 characters in base64url (what
 * npm start writes), 64 in hex. Shorter strings cannot hold that much randomness.
 */
export const MIN_SECRET_CHARACTERS = 43
const SECRET_RULE = `at least ${MIN_SECRET_CHARACTERS} characters of randomness (32 random bytes as base64url, e.g. \`node -e "console.log(require('crypto').randomBytes(32).toString('base64url'))"\`)`

const envSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
    HOST: z.string().default('127.0.0.1'),
    PORT: z.coerce.number().int().min(0).max(65535).default(4780),
    DB_HOST: z.string().default('127.0.0.1'),
    DB_PORT: z.coerce.number().int().min(1).max(65535).default(4781),
    DB_NAME: z
      .string()
      .regex(/^[a-z0-9_]+$/)
      .default('endplate'),
    DB_TEST_NAME: z
      .string()
      .regex(/^[a-z0-9_]+$/)
      .default('endplate_test'),
    DB_USER: z
      .string()
      .regex(/^[a-z0-9_]+$/)
      .default('endplate'),
    DB_PASSWORD: z
      .string()
      .min(1)
      .refine((value) => !isPlaceholder(value), {
        error: 'DB_PASSWORD is still the placeholder of .env.example: set a random value',
      }),
    // Owns the schema: runs migrations and grants the application user its rights table by table
    // (SELECT and INSERT only on the audit trail). The API never connects as it.
    DB_OWNER_USER: z
      .string()
      .regex(/^[a-z0-9_]+$/)
      .default('endplate_owner'),
    DB_OWNER_PASSWORD: z
      .string()
      .min(1)
      .refine((value) => !isPlaceholder(value), {
        error: 'DB_OWNER_PASSWORD is still the placeholder of .env.example: set a random value',
      }),
    DB_DATA_DIR: z.string().default('.data/mariadb'),
    DB_QUERY_TIMEOUT_MS: z.coerce.number().int().min(500).max(600_000).default(5_000),
    JWT_SECRET: z
      .string()
      .refine((value) => !isPlaceholder(value), {
        error: `JWT_SECRET is still the placeholder of .env.example: set ${SECRET_RULE} (npm start writes one into a new .env)`,
      })
      .refine((value) => value.length >= MIN_SECRET_CHARACTERS, {
        error: `JWT_SECRET is too short: set ${SECRET_RULE}`,
      }),
    SESSION_MINUTES: z.coerce
      .number()
      .int()
      .min(1)
      .max(24 * 60)
      .default(30),
    LOGIN_MAX_FAILURES: z.coerce.number().int().min(1).default(5),
    LOGIN_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).default(20),
    LOGIN_ATTEMPTS_PER_ACCOUNT_HOUR: z.coerce.number().int().min(1).default(30),
    UPLOAD_DIR: z.string().default('uploads'),
    UPLOAD_MAX_MB: z.coerce.number().positive().default(100),
    UPLOAD_REQUEST_MAX_MB: z.coerce.number().positive().default(500),
    UPLOAD_QUEUE_LIMIT: z.coerce.number().int().min(1).default(100),
    SMTP_HOST: z.string().default('127.0.0.1'),
    SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(4782),
    MAIL_FROM: z.string().default('Endplate <endplate@clinic.invalid>'),
    MAIL_FAKE: bool.default(true),
    // Where people open Endplate: the links in mails start with it. Empty means http://HOST:PORT.
    PUBLIC_URL: z
      .union([z.literal(''), z.url({ protocol: /^https?$/, error: 'must be an http(s) address' })])
      .default(''),
    LOG_LEVEL: z
      .enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent'])
      .default('info'),
  })
  .refine((env) => !(env.NODE_ENV === 'production' && env.MAIL_FAKE), {
    path: ['MAIL_FAKE'],
    error:
      'MAIL_FAKE=true catches every mail locally and must not run with NODE_ENV=production: set MAIL_FAKE=false and point SMTP_HOST and SMTP_PORT at the mail relay',
  })

export type AppConfig = Readonly<
  z.infer<typeof envSchema> & {
    uploadDirAbsolute: string
    dataDirAbsolute: string
    /** PUBLIC_URL without a trailing slash, or http://HOST:PORT when it is not set. */
    publicUrl: string
  }
>

/** Validates an environment (process.env by default) into the frozen configuration. */
export function parseConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  const parsed = envSchema.safeParse(env)
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`)
    throw new Error(`Invalid environment:\n  ${problems.join('\n  ')}`)
  }
  return Object.freeze({
    ...parsed.data,
    uploadDirAbsolute: resolve(projectRoot, parsed.data.UPLOAD_DIR),
    dataDirAbsolute: resolve(projectRoot, parsed.data.DB_DATA_DIR),
    publicUrl: (parsed.data.PUBLIC_URL || `http://${parsed.data.HOST}:${parsed.data.PORT}`).replace(
      /\/+$/,
      '',
    ),
  })
}

export const config: AppConfig = parseConfig()
