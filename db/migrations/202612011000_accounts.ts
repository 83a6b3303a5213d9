/**
 * Accounts: people with a role, invitations, password resets, API tokens and the audit log.
 * Link tokens and API tokens are stored only as SHA-256 hashes; passwords only as argon2id hashes.
 */
import type { Knex } from 'knex'

const roles = ['admin', 'lead', 'experimenter', 'technician', 'viewer']

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (table) => {
    table.increments('id').primary()
    // Stored lower-cased by the application; unique as such.
    table.text('email').notNullable().unique()
    table.text('name').notNullable()
    table.enu('role', roles).notNullable()
    table.text('password_hash').notNullable()
    // Bumped on sign-out, password reset and disabling: every older session cookie stops working.
    table.integer('session_version').notNullable().defaultTo(1)
    table.timestamp('disabled_at', { useTz: true })
    table.timestamp('last_sign_in_at', { useTz: true })
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })

  await knex.schema.createTable('invitations', (table) => {
    table.increments('id').primary()
    table.text('email').notNullable().index()
    table.enu('role', roles).notNullable()
    table.text('token_hash').notNullable().unique()
    table.integer('invited_by').references('users.id').onDelete('SET NULL')
    table.timestamp('expires_at', { useTz: true }).notNullable()
    table.timestamp('accepted_at', { useTz: true })
    // Set when a newer invitation for the same address supersedes this one.
    table.timestamp('replaced_at', { useTz: true })
    table.integer('user_id').references('users.id').onDelete('SET NULL')
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })

  await knex.schema.createTable('password_resets', (table) => {
    table.increments('id').primary()
    table.integer('user_id').notNullable().references('users.id').onDelete('CASCADE')
    table.text('token_hash').notNullable().unique()
    table.timestamp('expires_at', { useTz: true }).notNullable()
    table.timestamp('used_at', { useTz: true })
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })

  await knex.schema.createTable('api_tokens', (table) => {
    table.increments('id').primary()
    table.integer('user_id').notNullable().references('users.id').onDelete('CASCADE').index()
    table.text('name').notNullable()
    table.text('prefix').notNullable()
    table.text('token_hash').notNullable().unique()
    table.timestamp('last_used_at', { useTz: true })
    table.timestamp('revoked_at', { useTz: true })
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
  })

  await knex.schema.createTable('audit_events', (table) => {
    table.bigIncrements('id').primary()
    table.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.text('event').notNullable().index()
    table.integer('actor_id').references('users.id').onDelete('SET NULL')
    // Copied so the log still reads after an account is gone.
    table.text('actor_email')
    table.text('subject')
    table.text('ip')
    table.jsonb('details').notNullable().defaultTo('{}')
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_events')
  await knex.schema.dropTable('api_tokens')
  await knex.schema.dropTable('password_resets')
  await knex.schema.dropTable('invitations')
  await knex.schema.dropTable('users')
}
