/** Mail caught by the local SMTP fake (development and tests), read on the admin outbox page. */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('outbox_messages', (table) => {
    table.increments('id').primary()
    table.timestamp('received_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.text('envelope_from').notNullable()
    table.specificType('envelope_to', 'text[]').notNullable()
    table.text('subject').notNullable()
    table.text('text_body').notNullable()
    table.text('raw').notNullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('outbox_messages')
}
