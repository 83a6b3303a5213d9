/**
 * Which process runs an analysis (host name and process id), so a worker restarted on the same machine can hand
 * on at once the jobs its dead predecessor held (issue 17).
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('analyses', (table) => {
    table.text('worker_host').nullable()
    table.integer('worker_pid').nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('analyses', (table) => {
    table.dropColumn('worker_host')
    table.dropColumn('worker_pid')
  })
}
