// `npm start`: set up everything on a fresh machine and run the app.
// npm dependencies → Debian's PostgreSQL → a project-local cluster on 127.0.0.1 → schema and demo
// data → server and client builds (when stale) → the built server (`node dist/server/main.js`). Ctrl-C stops the
// app and the database cleanly.
import { spawn, spawnSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { buildCodeIfStale } from './build.mjs'
import { supervise } from './lib/supervise.mjs'
import { LocalPostgres, SetupError, assertPortFree, ensureNodeModules, ensurePostgres, ownSecretFile, projectRoot, say } from './lib/services.mjs'

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

let current = null
let stopping = false

function stopServer(signal) {
  stopping = true
  current?.kill(signal)
}

/** Start the server process, passing its output through (the listening line becomes our announcement). */
function runServer(env) {
  const server = spawn(process.execPath, ['dist/server/main.js'], { cwd: projectRoot, env, stdio: ['ignore', 'pipe', 'inherit'] })
  current = server
  server.stdout.on('data', (chunk) => {
    const text = chunk.toString()
    const match = /CAVITRACE_LISTENING (\S+)/.exec(text)
    if (match) announce(match[1], env)
    process.stdout.write(text.replace(/CAVITRACE_LISTENING \S+\n?/, ''))
  })
  return server
}

let announced = false
function announce(url, env) {
  if (announced) return say(`Cavitrace is running again at ${url}/`)
  announced = true
  say(`Cavitrace is running at ${url}/`)
  if (env.NODE_ENV === 'development') {
    const demo = demoSignIn()
    say(`demo sign-in: password "${demo.password}" for any of`)
    for (const email of demo.emails) say(`  ${email}`)
    say(`mail the app sends is caught locally: Admin → Outbox (${url}/admin/outbox)`)
  }
  say('Ctrl-C stops the app and its database.')
}

/** Keep the server up: after a crash it starts again a second later, with the database left running. */
function superviseServer(env) {
  return supervise({
    start: () => runServer(env),
    isStopping: () => stopping,
    onCrash: ({ exitCode, signal, givingUp }) =>
      say(givingUp ? 'the server crashed 5 times within a minute; giving up (see the messages above)' : `the server stopped unexpectedly (${signal ?? `exit ${exitCode}`}); starting it again in 1 s, the database stays up…`),
  })
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
    // The session-signing key lives beside the database's password, readable by this user only.
    if (!env.SESSION_SECRET && !env.SESSION_SECRET_FILE) {
      env.SESSION_SECRET_FILE = join(dataDir, 'session-secret')
      ownSecretFile(env.SESSION_SECRET_FILE)
    }
    if (await buildCodeIfStale()) say('built the server and the command line (dist/server, dist/cli)')
    runStep('migrating and seeding the database…', process.execPath, ['dist/server/prepare.js', '--seed'], env)
    if (process.env.CAVITRACE_SKIP_BUILD !== '1') runStep('building the client…', join(projectRoot, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn'], env)

    process.on('SIGINT', () => stopServer('SIGINT'))
    process.on('SIGTERM', () => stopServer('SIGTERM'))
    const code = await superviseServer(env)
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
