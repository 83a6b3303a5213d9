/**
 * API tokens expire (issue 17): `expires_at`, null for never. Tokens made before this get a year from now, so
 * no lab script stops without warning today.
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('api_tokens', (table) => {
    table.timestamp('expires_at', { useTz: true }).nullable()
  })
  await knex('api_tokens').update({ expires_at: knex.raw("now() + interval '1 year'") })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('api_tokens', (table) => {
    table.dropColumn('expires_at')
  })
}
