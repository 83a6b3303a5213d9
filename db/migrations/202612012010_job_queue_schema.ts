/**
 * The job queue's own tables (pg-boss, schema `pgboss`), installed with the app's schema so a fresh
 * database is complete after `migrate latest`. pg-boss upgrades its schema itself on start.
 */
import type { Knex } from 'knex'
import PgBoss from 'pg-boss'

// pg-boss's plan carries its own BEGIN/COMMIT, so Knex must not wrap it in another transaction.
export const config = { transaction: false }

export async function up(knex: Knex): Promise<void> {
  const exists = await knex.raw("select 1 from pg_namespace where nspname = 'pgboss'")
  if (exists.rows.length > 0) return
  await knex.raw(PgBoss.getConstructionPlans('pgboss'))
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP SCHEMA IF EXISTS pgboss CASCADE')
}
