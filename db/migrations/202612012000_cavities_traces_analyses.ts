/**
 * Cavities, uploaded traces (raw bytes kept gzip-compressed, deduplicated by SHA-256 per cavity) and
 * analyses (status, options, the geometry snapshot used, the result).
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('cavities', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'))
    table.text('name').notNullable().unique()
    table.text('description').notNullable().defaultTo('')
    table.text('location').notNullable().defaultTo('')
    table.double('wavelength_nm').notNullable()
    table.double('length_mm').notNullable()
    table.double('roc1_mm').nullable()
    table.double('roc2_mm').nullable()
    table.double('reflectivity1').nullable()
    table.double('reflectivity2').nullable()
    table.double('modulation_mhz').nullable()
    table.double('target_fundamental_fraction').nullable()
    table.boolean('archived').notNullable().defaultTo(false)
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })

  await knex.schema.createTable('traces', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'))
    table.uuid('cavity_id').notNullable().references('cavities.id').onDelete('CASCADE')
    table.text('sha256').notNullable()
    table.text('file_name').notNullable()
    table.bigInteger('size_bytes').notNullable()
    table.binary('content_gzip').notNullable()
    table.text('note').notNullable().defaultTo('')
    table.integer('uploaded_by').nullable().references('users.id').onDelete('SET NULL')
    table.timestamp('uploaded_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.unique(['cavity_id', 'sha256'])
  })

  await knex.schema.createTable('analyses', (table) => {
    table.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'))
    table.uuid('trace_id').notNullable().references('traces.id').onDelete('CASCADE')
    table.uuid('cavity_id').notNullable().references('cavities.id').onDelete('CASCADE')
    table.text('status').notNullable().defaultTo('queued')
    table.jsonb('options').notNullable().defaultTo('{}')
    table.jsonb('geometry').notNullable()
    table.jsonb('result').nullable()
    table.jsonb('error').nullable()
    table.double('fundamental_fraction').nullable()
    table.double('finesse').nullable()
    table.double('linewidth_hz').nullable()
    table.integer('attempts').notNullable().defaultTo(0)
    table.double('engine_ms').nullable()
    table.integer('requested_by').nullable().references('users.id').onDelete('SET NULL')
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.timestamp('started_at', { useTz: true }).nullable()
    table.timestamp('finished_at', { useTz: true }).nullable()
    table.index(['cavity_id', 'created_at'])
    table.index(['trace_id'])
  })
  await knex.raw("ALTER TABLE analyses ADD CONSTRAINT analyses_status_check CHECK (status IN ('queued', 'running', 'done', 'failed'))")
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('analyses')
  await knex.schema.dropTable('traces')
  await knex.schema.dropTable('cavities')
}
