/** Knex configuration for the Knex CLI and scripts; the app builds its own pool in server/db/knex.ts. */
import type { Knex } from 'knex'
import { migrationConfig } from './db/migrationSource'

const config: Knex.Config = {
  client: 'pg',
  connection: process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/cavitrace',
  migrations: migrationConfig,
}

export default config
