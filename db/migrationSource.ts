/**
 * Knex migration source that records migration names WITHOUT their file extension, so running them
 * from `.ts` (tsx) or from compiled `.js` never looks like a corrupt migration directory.
 */
import { readdirSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import type { Knex } from 'knex'

const migrationsDir = join(dirname(fileURLToPath(import.meta.url)), 'migrations')

interface MigrationFile {
  name: string
  file: string
}

export const migrationSource: Knex.MigrationSource<MigrationFile> = {
  async getMigrations() {
    return readdirSync(migrationsDir)
      .filter((file) => /^\d{12}_[a-z0-9_]+\.(ts|js)$/.test(file))
      .sort()
      .map((file) => ({ name: file.replace(/\.(ts|js)$/, ''), file }))
  },
  getMigrationName(migration) {
    return migration.name
  },
  async getMigration(migration) {
    return (await import(pathToFileURL(join(migrationsDir, migration.file)).href)) as Knex.Migration
  },
}

/** Migration settings used everywhere (app, scripts, tests). */
export const migrationConfig: Knex.MigratorConfig = { migrationSource, tableName: 'knex_migrations' }
