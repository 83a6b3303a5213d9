// `npm start`: set up everything on a fresh machine and run the app.
// npm dependencies → Debian's PostgreSQL → a project-local cluster on 127.0.0.1 → schema and demo
// data → server and client builds (when stale) → the built server (`node dist/server/main.js`). Ctrl-C stops the
// app and the database cleanly.
import { spawn, spawnSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { buildCodeIfStale } from './build.mjs'
import { LocalPostgres, SetupError, assertPortFree, ensureNodeModules, ensurePostgres, projectRoot, say } from './lib/services.mjs'

const appPort = Number(process.env.PORT ?? 3000)
const dbPort = Number(process.env.CAVITRACE_DB_PORT ?? 54329)
const dataDir = process.env.CAVITRACE_DATA_DIR ?? join(projectRoot, '.data', 'dev')

/** The demo people seeded in development, and their one password (shared/auth/demoAccounts.json). */
function demoSignIn() {
  const demo = JSON.parse(readFileSync(join(projectRoot, 'shared', 'auth', 'demoAccounts.json'), 'utf8'))
  return { password: demo.password, emails: demo.people.map((person) => `${person.email} (${person.role})`) }
}

function runStep(label, command, args, env) {
  say(label)
  const result = spawnSync(command, args, { cwd: projectRoot, stdio: 'inherit', env })
  if (result.status !== 0) throw new SetupError(`${label.replace(/…$/, '')} failed (exit ${result.status})`)
}

async function main() {
  if (!Number.isInteger(appPort) || appPort < 1 || appPort > 65535) throw new SetupError(`PORT must be a port number 1–65535 (got "${process.env.PORT}")`)
  await assertPortFree(appPort, 'the app port; set PORT to use another')
  ensureNodeModules()
  const cluster = new LocalPostgres({ bin: ensurePostgres(), dir: dataDir, port: dbPort })
  await cluster.start()
  let stopped = false
  const stopDatabase = () => {
    if (stopped) return
    stopped = true
    say('stopping the database…')
    cluster.stop()
  }

  try {
    await cluster.createDatabase('cavitrace')
    const env = { ...process.env, NODE_ENV: process.env.NODE_ENV ?? 'development', DATABASE_URL: process.env.DATABASE_URL ?? cluster.url('cavitrace'), PORT: String(appPort) }
    if (await buildCodeIfStale()) say('built the server and the command line (dist/server, dist/cli)')
    runStep('migrating and seeding the database…', process.execPath, ['dist/server/prepare.js', '--seed'], env)
    if (process.env.CAVITRACE_SKIP_BUILD !== '1') runStep('building the client…', join(projectRoot, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'], env)

    const server = spawn(process.execPath, ['dist/server/main.js'], { cwd: projectRoot, env, stdio: ['ignore', 'pipe', 'inherit'] })
    server.stdout.on('data', (chunk) => {
      const text = chunk.toString()
      const match = /CAVITRACE_LISTENING (\S+)/.exec(text)
      if (match) {
        say(`Cavitrace is running at ${match[1]}/`)
        if (env.NODE_ENV === 'development') {
          const demo = demoSignIn()
          say(`demo sign-in: password "${demo.password}" for any of`)
          for (const email of demo.emails) say(`  ${email}`)
          say(`mail the app sends is caught locally: Admin → Outbox (${match[1]}/admin/outbox)`)
        }
        say('Ctrl-C stops the app and its database.')
      }
      process.stdout.write(text.replace(/CAVITRACE_LISTENING \S+\n?/, ''))
    })
    const forward = (signal) => () => server.kill(signal)
    process.on('SIGINT', forward('SIGINT'))
    process.on('SIGTERM', forward('SIGTERM'))
    const code = await new Promise((resolve) => server.on('exit', (exitCode) => resolve(exitCode ?? 0)))
    stopDatabase()
    process.exit(code)
  } catch (error) {
    stopDatabase()
    throw error
  }
}

main().catch((error) => {
  process.stderr.write(`[cavitrace] ${error instanceof SetupError ? error.message : error?.stack ?? error}\n`)
  process.exit(1)
})
