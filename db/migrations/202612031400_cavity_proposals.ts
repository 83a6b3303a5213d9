/**
 * Cavity proposals: an experimenter with a new setup proposes a cavity; it stays out of the lab's lists and takes no
 * uploads until a lead or an admin approves it. A cavity created by a lead or admin needs no approval.
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cavities', (table) => {
    table.integer('proposed_by').nullable().references('users.id').onDelete('SET NULL')
    table.boolean('pending').notNullable().defaultTo(false)
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cavities', (table) => {
    table.dropColumn('pending')
    table.dropColumn('proposed_by')
  })
}
