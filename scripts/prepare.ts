/**
 * Bring a database to the current schema and (optionally) seed the demo lab. Used by `npm start`
 * (with `--seed`) and by `npm test` (schema only, for the template database).
 */
import { migrationConfig } from '../db/migrationSource'
import { seedDemo } from '../db/seeds/seedDemo'
import { createDb } from '../server/db/knex'

const url = process.env.DATABASE_URL
if (!url) throw new Error('DATABASE_URL is not set')
const db = createDb(url, { poolMax: 2 })
try {
  const [, names] = (await db.migrate.latest(migrationConfig)) as [number, string[]]
  process.stdout.write(`[cavitrace] database schema: ${names.length ? `applied ${names.join(', ')}` : 'up to date'}\n`)
  if (process.argv.includes('--seed')) {
    const { seeded } = await seedDemo(db)
    process.stdout.write(`[cavitrace] demo data: ${seeded ? 'seeded' : 'already present'}\n`)
  }
} finally {
  await db.destroy()
}
