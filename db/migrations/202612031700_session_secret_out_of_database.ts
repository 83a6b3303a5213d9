/**
 * The session-signing key no longer lives in the database (whoever reads the database or a dump could
 * forge sessions with it): it comes from SESSION_SECRET or SESSION_SECRET_FILE. Forget the old one.
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex('app_settings').where({ key: 'session_secret' }).delete()
}

export async function down(): Promise<void> {
  // Nothing to restore: a key made for the old scheme would be a fresh random one anyway.
}
