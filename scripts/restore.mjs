// `npm run restore -- FILE`: put a dump made by `npm run backup` back into the Cavitrace database (DATABASE_URL, or
// the project-local cluster). What the database holds now is replaced. Stop the app first (Ctrl-C in `npm start`).
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { clientEnvironment, targetDatabase } from './lib/database.mjs'
import { SetupError, say } from './lib/services.mjs'

async function main() {
  if (!process.argv[2]) throw new SetupError('name the dump to restore: npm run restore -- backups/cavitrace-….dump')
  const file = resolve(process.argv[2])
  if (!existsSync(file)) throw new SetupError(`no such file: ${file}`)
  const target = await targetDatabase()
  try {
    const { url, env } = clientEnvironment(target.url)
    say(`restoring ${file} (replacing what the database holds)…`)
    const result = spawnSync(join(target.bin, 'pg_restore'), ['--clean', '--if-exists', '--no-owner', '--single-transaction', '--exit-on-error', '--dbname', url, file], { env, stdio: 'inherit' })
    if (result.status !== 0) throw new SetupError(`pg_restore failed (exit ${result.status}); the database was left as it was`)
    say('restored. Start the app again (npm start); its migrations bring an older dump up to date.')
  } finally {
    target.done()
  }
}

main().catch((error) => {
  process.stderr.write(`[cavitrace] ${error instanceof SetupError ? error.message : error?.stack ?? error}\n`)
  process.exit(1)
})
