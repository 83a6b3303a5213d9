// Which database `npm run backup` / `npm run restore` work on: DATABASE_URL when set, otherwise the project-local
// cluster of `npm start` (CAVITRACE_DATA_DIR, CAVITRACE_DB_PORT), started for the job when it is not running.
import { join } from 'node:path'
import { LocalPostgres, ensurePostgres, projectRoot } from './services.mjs'

/** `{ url, bin, done }`: a connection string, the PostgreSQL client tools, and a function to call when finished. */
export async function targetDatabase() {
  const bin = ensurePostgres()
  if (process.env.DATABASE_URL) return { url: process.env.DATABASE_URL, bin, done: () => {} }
  const cluster = new LocalPostgres({ bin, dir: process.env.CAVITRACE_DATA_DIR ?? join(projectRoot, '.data', 'dev'), port: Number(process.env.CAVITRACE_DB_PORT ?? 54329) })
  const startedHere = await cluster.start()
  return { url: cluster.url('cavitrace'), bin, done: () => startedHere && cluster.stop() }
}

/** Environment for pg_dump / pg_restore: the password goes in PGPASSWORD, never on a command line others can read. */
export function clientEnvironment(url) {
  const parsed = new URL(url)
  const password = decodeURIComponent(parsed.password)
  parsed.password = ''
  return { url: parsed.toString(), env: { ...process.env, PGPASSWORD: password } }
}
