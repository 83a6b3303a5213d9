import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { migrationConfig } from '../../db/migrationSource'
import { seedDemo } from '../../db/seeds/seedDemo'
import { createDb, type Db } from '../../server/db/knex'
import { createTestDatabase, type TestDatabase } from '../support/testDatabase'

async function tableNames(db: Db): Promise<string[]> {
  const result = await db.raw<{ rows: Array<{ tablename: string }> }>("select tablename from pg_tables where schemaname = 'public' order by tablename")
  return result.rows.map((row) => row.tablename)
}

describe('migrations', () => {
  let database: TestDatabase
  let db: Db
  beforeAll(async () => {
    database = await createTestDatabase({ empty: true })
    db = createDb(database.url, { poolMax: 2 })
  })
  afterAll(async () => {
    await db.destroy()
    await database.drop()
  })

  it('when migrated up, rolled back and migrated again then every step succeeds and leaves the expected tables', async () => {
    const [, applied] = (await db.migrate.latest(migrationConfig)) as [number, string[]]
    expect(applied.length).toBeGreaterThan(0)
    expect(applied.every((name) => !/\.(ts|js)$/.test(name))).toBe(true) // names stored without extension
    expect(await tableNames(db)).toContain('app_settings')

    await db.migrate.rollback(migrationConfig, true)
    const afterRollback = await tableNames(db)
    expect(afterRollback.filter((name) => !name.startsWith('knex_'))).toEqual([])

    const [, again] = (await db.migrate.latest(migrationConfig)) as [number, string[]]
    expect(again).toEqual(applied)
  })

  it('when the demo seed runs twice then the second run changes nothing', async () => {
    await db.migrate.latest(migrationConfig)
    expect((await seedDemo(db)).seeded).toBe(true)
    const before = await db('app_settings').select('key', 'value').orderBy('key')
    expect((await seedDemo(db)).seeded).toBe(false)
    expect(await db('app_settings').select('key', 'value').orderBy('key')).toEqual(before)
  })
})
