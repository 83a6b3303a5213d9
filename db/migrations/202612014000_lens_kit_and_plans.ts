/**
 * The lab's lens kit (one row per kind of lens: focal length, how many, type, wavelength range, notes) and
 * mode-matching plans saved per cavity (who, when, the inputs, the chosen lenses, a note).
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('lenses', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'))
    // The lab's own short name for the lens (e.g. "PCX-100a"); unique so CSV imports can update by it.
    table.text('label').notNullable().unique()
    table.double('focal_length_mm').notNullable()
    table.integer('count').notNullable().defaultTo(1)
    table.text('type').notNullable().defaultTo('plano-convex')
    table.double('wavelength_min_nm').nullable()
    table.double('wavelength_max_nm').nullable()
    table.text('notes').notNullable().defaultTo('')
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })
  await knex.raw('ALTER TABLE lenses ADD CONSTRAINT lenses_count_not_negative CHECK (count >= 0)')

  await knex.schema.createTable('mode_matching_plans', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'))
    table.uuid('cavity_id').notNullable().references('cavities.id').onDelete('CASCADE')
    table.integer('created_by').nullable().references('users.id').onDelete('SET NULL')
    table.text('note').notNullable().defaultTo('')
    /** The planner request as sent (beam, table constraints, target). */
    table.jsonb('inputs').notNullable()
    /** The beam the inputs gave (after the caustic fit) and the cavity geometry at the time. */
    table.jsonb('beam').notNullable()
    table.jsonb('geometry').notNullable()
    /** The chosen lenses (a snapshot: focal lengths stay even if the kit changes) with coupling and tolerance. */
    table.jsonb('solution').notNullable()
    table.double('coupling').notNullable()
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.index(['cavity_id', 'created_at'])
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mode_matching_plans')
  await knex.schema.dropTable('lenses')
}
