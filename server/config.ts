/**
 * Configuration from the environment, validated once at start by one schema.
 * Every variable is documented here and in the README's configuration table; a bad value stops the
 * start with a message naming the variable.
 */
import { z } from 'zod'

const port = (fallback: number) =>
  z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number').min(0, 'must be 0–65535').max(65535, 'must be 0–65535').default(fallback)

export const configSchema = z.object({
  /** `development`, `test` or `production`. @default development */
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  /** Address the HTTP server binds. @default 127.0.0.1 */
  HOST: z.string().min(1).default('127.0.0.1'),
  /** HTTP port (0 = any free port, used by tests). @default 3000 */
  PORT: port(3000),
  /** PostgreSQL connection string. Required. */
  DATABASE_URL: z.string({ error: 'is required (a postgres:// connection string)' }).regex(/^postgres(ql)?:\/\//, 'must start with postgres:// or postgresql://'),
  /** Pino log level. @default info */
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  /** Folder with the built client (Vite output). Served when it exists. @default dist/client */
  CLIENT_DIR: z.string().default('dist/client'),
  /** Largest accepted upload in megabytes. @default 200 */
  UPLOAD_LIMIT_MB: z.coerce.number({ error: 'must be a number' }).positive('must be positive').max(10_000, 'must be at most 10000').default(200),
  /** Public URL of the app, used in e-mailed links. @default http://127.0.0.1:PORT */
  APP_URL: z.url({ error: 'must be a URL such as https://cavitrace.example.org' }).optional(),
})

export type AppConfig = z.infer<typeof configSchema>

/** Thrown when the environment holds a bad value; the message names every offending variable. */
export class ConfigError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'ConfigError'
  }
}

/** Parse and validate configuration from an environment-like object. */
export function loadConfig(env: Record<string, string | undefined> = process.env): AppConfig {
  const picked = Object.fromEntries(Object.keys(configSchema.shape).map((key) => [key, env[key] === '' ? undefined : env[key]]))
  const parsed = configSchema.safeParse(picked)
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => {
      const name = String(issue.path[0] ?? 'configuration')
      const value = picked[name]
      return `${name} ${issue.message}${value === undefined ? '' : ` (got "${value}")`}`
    })
    throw new ConfigError(`Invalid configuration: ${problems.join('; ')}`)
  }
  return parsed.data
}
