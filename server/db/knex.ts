/** The Knex instance for the app's PostgreSQL database. */
import knex, { type Knex } from 'knex'
import type { Logger } from 'pino'

export type Db = Knex

/** Open a connection pool. The pool connects lazily, so an unreachable server fails per query, not here. */
export function createDb(databaseUrl: string, options: { poolMax?: number; logger?: Logger } = {}): Db {
  const { logger } = options
  return knex({
    // Knex prints to the console by default; send its notes to our log (or nowhere in scripts).
    log: {
      warn: (message: unknown) => logger?.warn({ knex: message }, 'database warning'),
      error: (message: unknown) => logger?.error({ knex: message }, 'database error'),
      deprecate: (message: unknown) => logger?.warn({ knex: message }, 'database deprecation'),
      debug: (message: unknown) => logger?.debug({ knex: message }, 'database debug'),
    },
    client: 'pg',
    connection: { connectionString: databaseUrl, connectionTimeoutMillis: 2000 },
    pool: { min: 0, max: options.poolMax ?? 10 },
    acquireConnectionTimeout: 3000,
  })
}
