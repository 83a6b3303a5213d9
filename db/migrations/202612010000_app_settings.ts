/** Key/value settings of this installation (e.g. which demo data version has been seeded). */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('app_settings', (table) => {
    table.text('key').primary()
    table.jsonb('value').notNullable()
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('app_settings')
}
