/**
 * Demo data for development: an invented lab. Idempotent — safe to run on every start.
 * Each area of the app adds its own demo rows here as it lands.
 */
import type { Knex } from 'knex'

/** Bump when the demo data changes shape, so older demo databases are topped up. */
export const demoVersion = 1

export async function seedDemo(knex: Knex): Promise<{ seeded: boolean }> {
  const row = await knex('app_settings').where({ key: 'demo_version' }).first()
  if (row && Number(row.value) >= demoVersion) return { seeded: false }
  await knex.transaction(async (trx) => {
    await trx('app_settings')
      .insert({ key: 'lab_name', value: JSON.stringify('Halvorsen Lab for Precision Optics (demo)') })
      .onConflict('key')
      .ignore()
    await trx('app_settings')
      .insert({ key: 'demo_version', value: JSON.stringify(demoVersion), updated_at: trx.fn.now() })
      .onConflict('key')
      .merge()
  })
  return { seeded: true }
}
