// `npm run backup [-- FILE]`: a pg_dump (custom format) of the Cavitrace database into backups/ (or FILE),
// readable by this user only. The dump holds everything: people, password and token hashes, traces, analyses.
import { spawnSync } from 'node:child_process'
import { chmodSync, mkdirSync, statSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { clientEnvironment, targetDatabase } from './lib/database.mjs'
import { SetupError, projectRoot, say } from './lib/services.mjs'

async function main() {
  const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\..*/, '').replace('T', '-')
  const file = resolve(process.argv[2] ?? join(projectRoot, 'backups', `cavitrace-${stamp}.dump`))
  mkdirSync(dirname(file), { recursive: true, mode: 0o700 })
  const target = await targetDatabase()
  try {
    const { url, env } = clientEnvironment(target.url)
    say(`dumping the database to ${file}…`)
    const result = spawnSync(join(target.bin, 'pg_dump'), ['--format=custom', '--no-owner', '--file', file, '--dbname', url], { env, stdio: 'inherit', umask: 0o077 })
    if (result.status !== 0) throw new SetupError(`pg_dump failed (exit ${result.status})`)
    chmodSync(file, 0o600)
    say(`backup written: ${file} (${(statSync(file).size / 1048576).toFixed(1)} MB, readable by you only). It holds password and token hashes: keep it as safe as the database.`)
  } finally {
    target.done()
  }
}

main().catch((error) => {
  process.stderr.write(`[cavitrace] ${error instanceof SetupError ? error.message : error?.stack ?? error}\n`)
  process.exit(1)
})
