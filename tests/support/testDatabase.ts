/**
 * Each API test file gets its own database, cloned from the migrated template that `npm test`
 * prepares, so tests never see each other's rows.
 */
import { randomBytes } from 'node:crypto'
import pg from 'pg'

function requireEnv(name: string): string {
  const value = process.env[name]
  if (!value) throw new Error(`${name} is not set: run the API and browser tests through "npm test" (it starts their database)`)
  return value
}

/** Connection string of a database in the test cluster. */
export function testDatabaseUrl(database: string): string {
  return `${requireEnv('CAVITRACE_TEST_PG').replace(/\/$/, '')}/${database}`
}

async function withAdmin<T>(work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: testDatabaseUrl('postgres') })
  await client.connect()
  try {
    return await work(client)
  } finally {
    await client.end()
  }
}

export interface TestDatabase {
  name: string
  url: string
  drop(): Promise<void>
}

/** Create a fresh database: a copy of the migrated template, or empty with `{ empty: true }`. */
export async function createTestDatabase(options: { empty?: boolean } = {}): Promise<TestDatabase> {
  const name = `t_${randomBytes(6).toString('hex')}`
  const template = options.empty ? 'template0' : requireEnv('CAVITRACE_TEST_TEMPLATE_DB')
  // Cloning needs the template to be idle; retry briefly if another file is cloning it right now.
  for (let attempt = 0; ; attempt++) {
    try {
      await withAdmin((client) => client.query(`CREATE DATABASE ${name} TEMPLATE ${template}`))
      break
    } catch (error) {
      if (attempt >= 20 || !/being accessed by other users/.test(String(error))) throw error
      await new Promise((resolve) => setTimeout(resolve, 100 + Math.random() * 200))
    }
  }
  return {
    name,
    url: testDatabaseUrl(name),
    drop: () => withAdmin((client) => client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)).then(() => undefined),
  }
}
