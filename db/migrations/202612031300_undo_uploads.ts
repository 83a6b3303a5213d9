/**
 * Undoing a wrong upload: a trace can be deleted (soft: kept 30 days for an admin to restore, its analyses hidden
 * with it), and an analysis can be excluded from history, trends and alerts with a reason. A cavity remembers the
 * sample interval last given for its one-column exports.
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('traces', (table) => {
    table.timestamp('deleted_at', { useTz: true }).nullable()
    table.integer('deleted_by').nullable().references('users.id').onDelete('SET NULL')
    table.text('delete_reason').nullable()
  })
  await knex.schema.alterTable('analyses', (table) => {
    // Copied from the trace when it is deleted, so every query on analyses needs one column, not a join.
    table.timestamp('deleted_at', { useTz: true }).nullable()
    table.timestamp('excluded_at', { useTz: true }).nullable()
    table.integer('excluded_by').nullable().references('users.id').onDelete('SET NULL')
    table.text('exclusion_reason').nullable()
  })
  await knex.schema.alterTable('cavities', (table) => {
    table.double('sample_interval_s').nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cavities', (table) => {
    table.dropColumn('sample_interval_s')
  })
  await knex.schema.alterTable('analyses', (table) => {
    table.dropColumn('exclusion_reason')
    table.dropColumn('excluded_by')
    table.dropColumn('excluded_at')
    table.dropColumn('deleted_at')
  })
  await knex.schema.alterTable('traces', (table) => {
    table.dropColumn('delete_reason')
    table.dropColumn('deleted_by')
    table.dropColumn('deleted_at')
  })
}
