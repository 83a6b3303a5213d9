/**
 * Demo data for development: an invented lab. Idempotent — safe to run on every start.
 * Each area of the app adds its own demo rows here as it lands.
 */
import type { Knex } from 'knex'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { hashPassword } from '../../server/auth/passwords'
import { seedDemoLab } from './seedDemoLab'
import { seedDemoLenses } from './seedDemoLenses'
import { seedDemoLogbook } from './seedDemoLogbook'

/** Bump when the demo data changes shape, so older demo databases are topped up. */
export const demoVersion = 5

/** One invented person per role, all with the documented demo password — never in production. */
async function seedDemoPeople(trx: Knex): Promise<void> {
  if (process.env.NODE_ENV === 'production') return
  const passwordHash = await hashPassword(demoPassword)
  for (const person of demoPeople) {
    await trx('users').insert({ email: person.email, name: person.name, role: person.role, password_hash: passwordHash }).onConflict('email').ignore()
  }
}

export async function seedDemo(knex: Knex): Promise<{ seeded: boolean }> {
  const row = await knex('app_settings').where({ key: 'demo_version' }).first()
  if (row && Number(row.value) >= demoVersion) return { seeded: false }
  await knex.transaction(async (trx) => {
    await trx('app_settings')
      .insert({ key: 'lab_name', value: JSON.stringify('North Wing Optics Lab (demo)') })
      .onConflict('key')
      .ignore()
    await seedDemoPeople(trx)
    if (process.env.NODE_ENV !== 'production') {
      await seedDemoLab(trx)
      await seedDemoLogbook(trx)
      await seedDemoLenses(trx)
    }
    await trx('app_settings')
      .insert({ key: 'demo_version', value: JSON.stringify(demoVersion), updated_at: trx.fn.now() })
      .onConflict('key')
      .merge()
  })
  return { seeded: true }
}
