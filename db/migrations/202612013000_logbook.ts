/**
 * The maintenance log: an editable list of entry kinds, entries per cavity (when, who, what kind,
 * text) and the traces attached to an entry (uploaded from it or linked from the cavity's own).
 */
import type { Knex } from 'knex'

const builtInKinds = [
  { key: 'cleaning', label: 'Cleaning' },
  { key: 'realignment', label: 'Realignment' },
  { key: 'mirror_change', label: 'Mirror change' },
  { key: 'lens_change', label: 'Lens change' },
  { key: 'inspection', label: 'Inspection' },
  { key: 'other', label: 'Other' },
]

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('log_kinds', (table) => {
    table.text('key').primary()
    table.text('label').notNullable().unique()
    table.boolean('built_in').notNullable().defaultTo(false)
    table.integer('position').notNullable().defaultTo(100)
    table.integer('created_by').nullable().references('users.id').onDelete('SET NULL')
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex('log_kinds').insert(builtInKinds.map((kind, index) => ({ ...kind, built_in: true, position: index })))

  await knex.schema.createTable('log_entries', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'))
    table.uuid('cavity_id').notNullable().references('cavities.id').onDelete('CASCADE')
    table.timestamp('occurred_at', { useTz: true }).notNullable()
    table.integer('author_id').nullable().references('users.id').onDelete('SET NULL')
    table.text('kind').notNullable().references('log_kinds.key').onUpdate('CASCADE')
    table.text('text').notNullable().defaultTo('')
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.index(['cavity_id', 'occurred_at'])
  })

  await knex.schema.createTable('log_entry_traces', (table) => {
    table.uuid('entry_id').notNullable().references('log_entries.id').onDelete('CASCADE')
    table.uuid('trace_id').notNullable().references('traces.id').onDelete('CASCADE').index()
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.primary(['entry_id', 'trace_id'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('log_entry_traces')
  await knex.schema.dropTable('log_entries')
  await knex.schema.dropTable('log_kinds')
}
