/**
 * Uploaded traces stored in 1 MiB pieces (issue 17: an upload must not be held whole in the server's memory, and one
 * bytea value has to be). `traces.content_gzip` stays for traces stored whole (the demo seed, older uploads) and is
 * null for chunked ones.
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('trace_content_chunks', (table) => {
    table.uuid('trace_id').notNullable().references('traces.id').onDelete('CASCADE')
    table.integer('seq').notNullable()
    table.binary('bytes').notNullable()
    table.primary(['trace_id', 'seq'])
  })
  await knex.schema.alterTable('traces', (table) => {
    table.binary('content_gzip').nullable().alter()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`UPDATE traces SET content_gzip = (SELECT string_agg(bytes, ''::bytea ORDER BY seq) FROM trace_content_chunks WHERE trace_id = traces.id) WHERE content_gzip IS NULL`)
  await knex.schema.alterTable('traces', (table) => {
    table.binary('content_gzip').notNullable().alter()
  })
  await knex.schema.dropTable('trace_content_chunks')
}
