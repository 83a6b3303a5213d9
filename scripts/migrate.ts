/**
 * `npm run migrate -- [latest|rollback|status]`: run Knex migrations against DATABASE_URL.
 * `rollback` undoes every migration (use in development only).
 */
import { createDb } from '../server/db/knex'
import { migrationConfig } from '../db/migrationSource'

const action = process.argv[2] ?? 'latest'
const url = process.env.DATABASE_URL
if (!url) {
  process.stderr.write('DATABASE_URL is not set\n')
  process.exit(1)
}
const db = createDb(url, { poolMax: 2 })
try {
  if (action === 'latest') {
    const [, names] = (await db.migrate.latest(migrationConfig)) as [number, string[]]
    process.stdout.write(names.length ? `migrated: ${names.join(', ')}\n` : 'database is up to date\n')
  } else if (action === 'rollback') {
    const [, names] = (await db.migrate.rollback(migrationConfig, true)) as [number, string[]]
    process.stdout.write(`rolled back: ${names.join(', ') || 'nothing'}\n`)
  } else if (action === 'status') {
    const [done, pending] = (await db.migrate.list(migrationConfig)) as [Array<{ name: string }>, Array<{ file: string }>]
    process.stdout.write(`applied: ${done.length}, pending: ${pending.length}\n`)
  } else {
    process.stderr.write(`unknown action "${action}" (use latest, rollback or status)\n`)
    process.exitCode = 1
  }
} finally {
  await db.destroy()
}
