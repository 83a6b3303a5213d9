/**
 * Alerts: a finesse-drop threshold per cavity (beside its TEM00-fraction target), who watches which
 * cavity, the breach state per cavity and rule (so an ongoing breach is announced once), and the
 * in-app notifications, each carrying the state of its e-mail.
 */
import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cavities', (table) => {
    // Percent below the cavity's 30-day median finesse that counts as a drop; null = no finesse alert.
    table.double('finesse_drop_percent').nullable()
  })

  await knex.schema.createTable('cavity_watchers', (table) => {
    table.uuid('cavity_id').notNullable().references('cavities.id').onDelete('CASCADE')
    table.integer('user_id').notNullable().references('users.id').onDelete('CASCADE').index()
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.primary(['cavity_id', 'user_id'])
  })

  await knex.schema.createTable('cavity_alert_states', (table) => {
    table.uuid('cavity_id').notNullable().references('cavities.id').onDelete('CASCADE')
    table.text('kind').notNullable()
    table.boolean('breached').notNullable().defaultTo(false)
    // When the ongoing breach began (null while none).
    table.timestamp('since', { useTz: true }).nullable()
    // The analysis that last changed the state.
    table.uuid('analysis_id').nullable().references('analyses.id').onDelete('SET NULL')
    table.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.primary(['cavity_id', 'kind'])
  })

  await knex.schema.createTable('notifications', (table) => {
    table.bigIncrements('id').primary()
    table.integer('user_id').notNullable().references('users.id').onDelete('CASCADE')
    table.uuid('cavity_id').nullable().references('cavities.id').onDelete('CASCADE')
    table.uuid('analysis_id').nullable().references('analyses.id').onDelete('SET NULL')
    table.text('kind').notNullable()
    table.text('title').notNullable()
    table.text('body').notNullable().defaultTo('')
    table.jsonb('details').notNullable().defaultTo('{}')
    table.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now())
    table.timestamp('read_at', { useTz: true }).nullable()
    // none (in-app only), pending, sending, sent, failed.
    table.text('mail_status').notNullable().defaultTo('none')
    table.integer('mail_attempts').notNullable().defaultTo(0)
    table.timestamp('mail_claimed_at', { useTz: true }).nullable()
    table.timestamp('mailed_at', { useTz: true }).nullable()
    table.index(['user_id', 'created_at'])
  })
  await knex.raw("ALTER TABLE notifications ADD CONSTRAINT notifications_mail_status_check CHECK (mail_status IN ('none', 'pending', 'sending', 'sent', 'failed'))")
  await knex.raw("CREATE INDEX notifications_mail_waiting ON notifications (id) WHERE mail_status IN ('pending', 'sending')")
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('notifications')
  await knex.schema.dropTable('cavity_alert_states')
  await knex.schema.dropTable('cavity_watchers')
  await knex.schema.alterTable('cavities', (table) => {
    table.dropColumn('finesse_drop_percent')
  })
}
