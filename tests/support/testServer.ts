/**
 * Start the real server in-process on port 0 against a fresh test database: the built one (dist/server/server.js)
 * when CAVITRACE_TEST_SERVER=built, as `npm test` sets it, so a fault of the build cannot hide; else the sources.
 */
import { fileURLToPath } from 'node:url'
import pino from 'pino'
import { seedDemo } from '../../db/seeds/seedDemo'
import { loadConfig, type AppConfig } from '../../server/config'
import type { RunningServer } from '../../server/server'
import { createTestDatabase, type TestDatabase } from './testDatabase'

export interface TestServer extends RunningServer {
  database: TestDatabase
  config: AppConfig
  /** Stop the server and drop its database. */
  close(): Promise<void>
}

/**
 * `env` overrides configuration variables; `seedDemo: true` adds the development demo data,
 * including one demo person per role (see shared/auth/demoAccounts.json).
 */
type ServerModule = typeof import('../../server/server')

/** The server module the tests run: built or sources (see above). */
export async function serverModule(): Promise<ServerModule> {
  if (process.env.CAVITRACE_TEST_SERVER !== 'built') return import('../../server/server')
  const built = fileURLToPath(new URL('../../dist/server/server.js', import.meta.url))
  return (await import(/* @vite-ignore */ built)) as ServerModule
}

export async function startTestServer(env: Record<string, string> = {}, options: { seedDemo?: boolean } = {}): Promise<TestServer> {
  const database = await createTestDatabase()
  const config = loadConfig({ NODE_ENV: 'test', PORT: '0', LOG_LEVEL: 'silent', DATABASE_URL: database.url, CLIENT_DIR: process.env.CLIENT_DIR ?? 'dist/client', ...env })
  // CAVITRACE_TEST_LOG=debug shows the server's log while debugging a test.
  const { startServer } = await serverModule()
  const running = await startServer(config, { logger: pino({ level: process.env.CAVITRACE_TEST_LOG ?? 'silent' }) })
  if (options.seedDemo) await seedDemo(running.db)
  return {
    ...running,
    database,
    config,
    async close() {
      await running.stop()
      await database.drop()
    },
  }
}
